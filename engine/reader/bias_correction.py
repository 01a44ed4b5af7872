"""Bias correction after int8 weight rounding (Nagel et al., 2019, "Data-Free Quantization Through Weight
Equalization and Bias Correction", section 4.2).

A Linear y = W x + b whose weights are rounded to W_int8 = W + e gives y + e x; over inputs, its output is off by
e E[x] on average. Subtracting that from the bias removes the systematic part of the rounding error:

    b' = b - e E[x]

E[x], the mean of each input channel, is measured once on training windows (``measure_input_means``) and kept in the
model folder as safetensors (``INPUT_MEANS_FILE``). The int8 kernels and their speed are unchanged.
"""

from __future__ import annotations

import os
from pathlib import Path
from typing import Iterable, Mapping

import numpy as np

INPUT_MEANS_FILE = "input_means.safetensors"


def corrected_bias(bias: np.ndarray, weight_error: np.ndarray, input_mean: np.ndarray) -> np.ndarray:
    """b' = b - e E[x], for e (out x in) the rounding error of the weights and E[x] (in) the mean input."""
    bias = np.asarray(bias, dtype=np.float64)
    weight_error = np.asarray(weight_error, dtype=np.float64)
    input_mean = np.asarray(input_mean, dtype=np.float64)
    if weight_error.ndim != 2 or bias.shape != weight_error.shape[:1] or input_mean.shape != weight_error.shape[1:]:
        raise ValueError(f"need bias (out,), weight error (out, in) and input mean (in,) (got {bias.shape}, "
                         f"{weight_error.shape} and {input_mean.shape})")
    return bias - weight_error @ input_mean


def correctable_linears(model) -> list[str]:
    """Names of the encoder's Linear layers (the span head ``qa_outputs`` is never quantised)."""
    import torch

    return [name for name, module in model.named_modules()
            if isinstance(module, torch.nn.Linear) and "qa_outputs" not in name]


def measure_input_means(model, encoded_windows: Iterable[Mapping]) -> dict[str, np.ndarray]:
    """E[x] per input channel of every correctable Linear: the mean over every token of every window.

    Each window is one unpadded forward pass (batch of one), so padding positions never count.
    """
    import torch

    modules = dict(model.named_modules())
    sums: dict[str, torch.Tensor] = {}
    counts: dict[str, int] = {}

    def recorder(name):
        def hook(_module, inputs):
            rows = inputs[0].detach().reshape(-1, inputs[0].shape[-1]).double()
            sums[name] = rows.sum(dim=0) + sums.get(name, 0.0)
            counts[name] = counts.get(name, 0) + rows.shape[0]
        return hook

    handles = [modules[name].register_forward_pre_hook(recorder(name)) for name in correctable_linears(model)]
    try:
        with torch.inference_mode():
            for window in encoded_windows:
                model(**{k: torch.as_tensor(np.asarray(v))[None, :] for k, v in window.items()})
    finally:
        for handle in handles:
            handle.remove()
    if not counts:
        raise ValueError("measure_input_means needs at least one window (got 0)")
    return {name: (sums[name] / counts[name]).numpy().astype(np.float32) for name in sums}


def save_input_means(means: Mapping[str, np.ndarray], folder: Path) -> Path:
    """Write ``INPUT_MEANS_FILE`` into ``folder`` atomically (temporary file, then rename)."""
    from safetensors.numpy import save_file

    target = Path(folder) / INPUT_MEANS_FILE
    tmp = target.with_name(target.name + ".tmp")
    save_file({name: np.ascontiguousarray(v, dtype=np.float32) for name, v in means.items()}, str(tmp))
    os.replace(tmp, target)
    return target


def load_input_means(folder: Path) -> dict[str, np.ndarray]:
    from safetensors.numpy import load_file

    path = Path(folder) / INPUT_MEANS_FILE
    if not path.is_file():
        raise FileNotFoundError(f"a bias-corrected int8 path needs {INPUT_MEANS_FILE} in the reader folder; run "
                                f"calibrate-reader to measure it (missing: {path})")
    return load_file(str(path))


def correct_biases(quantized_model, float_weights: Mapping[str, "object"], means: Mapping[str, np.ndarray]) -> None:
    """Give every dynamically quantised Linear named in ``float_weights`` (its fp32 weight before rounding) the bias
    b - e E[x]. Raises ValueError when ``means`` lacks a layer or has the wrong width for it."""
    import torch

    modules = dict(quantized_model.named_modules())
    for name, weight in sorted(float_weights.items()):
        module = modules[name]
        mean = means.get(name)
        if mean is None or np.asarray(mean).shape != (weight.shape[1],):
            got = np.asarray(mean).shape if mean is not None else "nothing"
            raise ValueError(f"input means for {name} must have {weight.shape[1]} channels (got {got})")
        rounded = module.weight()
        error = (rounded.dequantize() - weight).double().numpy()
        bias = module.bias()
        old = bias.detach().double().numpy() if bias is not None else np.zeros(weight.shape[0])
        module.set_weight_bias(rounded, torch.from_numpy(corrected_bias(old, error, mean)).float())
