"""Activation smoothing before int8 dynamic quantisation (Xiao et al., 2023, "SmoothQuant").

Dynamic int8 gives each Linear's input one scale per tensor, so a few input channels with large values cost every
other channel its precision. Smoothing moves part of that range into the weights. Per input channel j:

    s_j = max|X_j| ** alpha / max_i |W_ij| ** (1 - alpha)

and the layer computes (X diag(s)^-1)(diag(s) W^T) + b, the same product in exact arithmetic. In BERT the LayerNorm
output also feeds the residual sum, so 1/s cannot be folded into the LayerNorm: ``SmoothedLinear`` multiplies its
input by 1/s at run time. max|X_j| is measured once on training windows (``measure_activation_ranges``) and kept in
the model folder as safetensors (``ACTIVATION_RANGES_FILE``).
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import Iterable, Mapping

import numpy as np

from engine import defaults

ACTIVATION_RANGES_FILE = "activation_ranges.safetensors"
# Channels whose range is ~0 (never active, or all-zero weight columns) get this floor instead, so s stays finite.
RANGE_FLOOR = 1e-5


def smoothing_scales(activation_max: np.ndarray, weight_max: np.ndarray,
                     alpha: float = defaults.SMOOTHING_ALPHA) -> np.ndarray:
    """s_j = max|X_j|^alpha / max|W_j|^(1 - alpha), with both maxima floored at RANGE_FLOOR.

    After smoothing, channel j's activation range is max|X_j| / s_j and its weight range is max|W_j| * s_j; at
    alpha = 0.5 both equal sqrt(max|X_j| * max|W_j|).
    """
    if not 0.0 <= alpha <= 1.0:
        raise ValueError(f"alpha must be in [0, 1] (got {alpha})")
    activation_max = np.asarray(activation_max, dtype=np.float64)
    weight_max = np.asarray(weight_max, dtype=np.float64)
    if activation_max.shape != weight_max.shape or activation_max.ndim != 1:
        raise ValueError(f"need two 1-D arrays of one length (got {activation_max.shape} and {weight_max.shape})")
    if (activation_max < 0).any() or (weight_max < 0).any():
        raise ValueError(f"ranges are absolute maxima and cannot be negative (got min {activation_max.min()}, "
                         f"{weight_max.min()})")
    a = np.maximum(activation_max, RANGE_FLOOR)
    w = np.maximum(weight_max, RANGE_FLOOR)
    return a ** alpha / w ** (1.0 - alpha)


def smoothable_linears(model) -> list[str]:
    """Names of the encoder's Linear layers (the span head ``qa_outputs`` is never quantised)."""
    import torch

    return [name for name, module in model.named_modules()
            if isinstance(module, torch.nn.Linear) and "qa_outputs" not in name]


def measure_activation_ranges(model, encoded_windows: Iterable[Mapping]) -> dict[str, np.ndarray]:
    """max|X_j| over every token of every window, per input channel of every smoothable Linear.

    Each window is one unpadded forward pass (batch of one), so padding positions never count.
    """
    import torch

    modules = dict(model.named_modules())
    ranges: dict[str, torch.Tensor] = {}

    def recorder(name):
        def hook(_module, inputs):
            seen = inputs[0].detach().abs().reshape(-1, inputs[0].shape[-1]).amax(dim=0).float()
            ranges[name] = seen if name not in ranges else torch.maximum(ranges[name], seen)
        return hook

    handles = [modules[name].register_forward_pre_hook(recorder(name)) for name in smoothable_linears(model)]
    count = 0
    try:
        with torch.inference_mode():
            for window in encoded_windows:
                model(**{k: torch.as_tensor(np.asarray(v))[None, :] for k, v in window.items()})
                count += 1
    finally:
        for handle in handles:
            handle.remove()
    if count == 0:
        raise ValueError("measure_activation_ranges needs at least one window (got 0)")
    return {name: value.numpy().astype(np.float32) for name, value in ranges.items()}


def save_activation_ranges(ranges: Mapping[str, np.ndarray], folder: Path) -> Path:
    """Write ``ACTIVATION_RANGES_FILE`` into ``folder`` atomically (temporary file, then rename)."""
    from safetensors.numpy import save_file

    target = Path(folder) / ACTIVATION_RANGES_FILE
    tmp = target.with_name(target.name + ".tmp")
    save_file({name: np.ascontiguousarray(v, dtype=np.float32) for name, v in ranges.items()}, str(tmp))
    os.replace(tmp, target)
    return target


def load_activation_ranges(folder: Path) -> dict[str, np.ndarray]:
    from safetensors.numpy import load_file

    path = Path(folder) / ACTIVATION_RANGES_FILE
    if not path.is_file():
        raise FileNotFoundError(f"a smoothed int8 path needs {ACTIVATION_RANGES_FILE} in the reader folder; run "
                                f"calibrate-reader to measure it (missing: {path})")
    return load_file(str(path))


def _smoothed_linear_class():
    import torch

    class SmoothedLinear(torch.nn.Module):
        """``linear(x * inverse_scale)``, where ``linear`` already holds the weights scaled by s per input channel."""

        def __init__(self, inverse_scale: torch.Tensor, linear: torch.nn.Module) -> None:
            super().__init__()
            self.register_buffer("inverse_scale", inverse_scale)
            self.linear = linear

        def forward(self, x):
            return self.linear(x * self.inverse_scale)

    return SmoothedLinear


def smooth_linears(model, names: Iterable[str], ranges: Mapping[str, np.ndarray],
                   alpha: float = defaults.SMOOTHING_ALPHA) -> list[str]:
    """Replace each named Linear by a SmoothedLinear in place; returns the names of the inner Linear layers, which
    are the ones to quantise. Raises ValueError if ``ranges`` lacks a layer or has the wrong width for it."""
    import torch

    smoothed_linear = _smoothed_linear_class()
    modules = dict(model.named_modules())
    inner_names = []
    for name in sorted(names):
        linear = modules[name]
        if name not in ranges or np.asarray(ranges[name]).shape != (linear.in_features,):
            got = np.asarray(ranges[name]).shape if name in ranges else "nothing"
            raise ValueError(f"activation ranges for {name} must have {linear.in_features} channels (got {got})")
        with torch.no_grad():
            weight_max = linear.weight.abs().amax(dim=0).double().numpy()
            scale = torch.from_numpy(smoothing_scales(ranges[name], weight_max, alpha)).to(linear.weight.dtype)
            linear.weight.mul_(scale[None, :])
        parent_name, _, child = name.rpartition(".")
        parent = modules[parent_name] if parent_name else model
        setattr(parent, child, smoothed_linear(1.0 / scale, linear))
        inner_names.append(f"{name}.linear")
    return inner_names
