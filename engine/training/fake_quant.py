"""Quantisation-aware fine-tuning: train through the int8 rounding the shipped inference path applies.

The chosen Linear layers (the same ones ``quantize_reader`` turns into int8) round their weight and their input onto
the grids of ``torch.ao.quantization.quantize_dynamic`` in the forward pass; the backward pass treats each rounding
as the identity (the straight-through estimator). This is quantisation-aware training (Jacob et al., 2018,
"Quantization and Training of Neural Networks for Efficient Integer-Arithmetic-Only Inference"), which Zafrir et al.,
2019 ("Q8BERT: Quantized 8Bit BERT") applied to BERT fine-tuning on SQuAD.

Grids (torch's dynamic int8 Linear on x86, fbgemm):
- weight, symmetric int8: s = max|w| / 127.5 over the tensor, or over each output row for a ``-per-channel`` mode;
  q = clamp(round(w / s), -128, 127); w' = q s.
- input, asymmetric at run time, 7 bits (fbgemm's reduce_range): lo = min(min x, 0), hi = max(max x, 0),
  s = (hi - lo) / 127, z = clamp(round(-lo / s), 0, 127); x' = (clamp(round(x / s) + z, 0, 127) - z) s. The range is
  taken over each window of a (windows, tokens, features) input, because the reader reads int8 windows one per
  forward pass (``TransformerReader.window_logits``); over the whole tensor for any other shape.
The weights stay fp32 and are saved as usual; only the forward pass sees the grids.
"""

from __future__ import annotations

import torch
from torch import nn

from engine.reader.transformer_reader import PER_CHANNEL_SUFFIX, PER_TOKEN_SUFFIX, QUANTIZE_CHOICES, \
    quantized_layer_names, replace_module

# The modes fake quantisation reproduces: torch's quantize_dynamic grids. Per-token int8 is not among them.
FAKE_QUANT_CHOICES = tuple(m for m in QUANTIZE_CHOICES if not m.endswith(PER_TOKEN_SUFFIX))

WEIGHT_QMIN, WEIGHT_QMAX = -128, 127
INPUT_QMAX = 127  # reduce_range: 7 bits for the uint8 input


def _straight_through(x: torch.Tensor, rounded: torch.Tensor) -> torch.Tensor:
    """``rounded`` in the forward pass, the identity's gradient in the backward pass."""
    return x + (rounded - x).detach()


def fake_quantize_weight(weight: torch.Tensor, per_channel: bool) -> torch.Tensor:
    """Symmetric int8 rounding of a weight, s = max|w| / 127.5 per tensor or per output row."""
    w = weight.detach().float()
    amax = w.abs().amax(dim=1, keepdim=True) if per_channel else w.abs().amax()
    scale = torch.clamp(amax / ((WEIGHT_QMAX - WEIGHT_QMIN) / 2), min=torch.finfo(torch.float32).eps)
    rounded = torch.clamp(torch.round(w / scale), WEIGHT_QMIN, WEIGHT_QMAX) * scale
    return _straight_through(weight, rounded.to(weight.dtype))


def fake_quantize_input(x: torch.Tensor) -> torch.Tensor:
    """Asymmetric 7-bit rounding of an activation, its range (per window of a 3-D input) widened to hold 0."""
    v = x.detach().float()
    if v.dim() == 3:
        lo, hi = v.amin(dim=(1, 2), keepdim=True), v.amax(dim=(1, 2), keepdim=True)
    else:
        lo, hi = v.min(), v.max()
    lo, hi = torch.clamp(lo, max=0.0), torch.clamp(hi, min=0.0)
    scale = torch.clamp((hi - lo) / INPUT_QMAX, min=torch.finfo(torch.float32).eps)
    zero = torch.clamp(torch.round(-lo / scale), 0, INPUT_QMAX)
    rounded = (torch.clamp(torch.round(v / scale) + zero, 0, INPUT_QMAX) - zero) * scale
    return _straight_through(x, rounded.to(x.dtype))


class FakeQuantLinear(nn.Linear):
    """A Linear layer whose forward pass sees its weight and input on the int8 grids; same parameters and names."""

    def __init__(self, source: nn.Linear, per_channel: bool):
        super().__init__(source.in_features, source.out_features, bias=source.bias is not None,
                         device="meta")
        self.weight, self.bias = source.weight, source.bias  # the very same Parameters: optimiser and saving see no change
        self.per_channel = per_channel

    def forward(self, x: torch.Tensor) -> torch.Tensor:
        return nn.functional.linear(fake_quantize_input(x), fake_quantize_weight(self.weight, self.per_channel),
                                    self.bias)


def apply_fake_quant(model: nn.Module, mode: str) -> list[str]:
    """Swap each Linear layer ``mode`` would quantise for a FakeQuantLinear sharing its parameters, in place.

    Returns the swapped layers' names, sorted ("none" swaps nothing). The model's state dict keys do not change.
    """
    if mode not in FAKE_QUANT_CHOICES:
        raise ValueError(f"fake quantisation supports {FAKE_QUANT_CHOICES} (got {mode!r})")
    names = sorted(quantized_layer_names(model, mode))
    per_channel = mode.endswith(PER_CHANNEL_SUFFIX)
    for name in names:
        replace_module(model, name, FakeQuantLinear(model.get_submodule(name), per_channel))
    return names


def remove_fake_quant(model: nn.Module) -> int:
    """Swap every FakeQuantLinear back for a plain Linear with the same parameters; returns how many."""
    swapped = [(name, m) for name, m in model.named_modules() if isinstance(m, FakeQuantLinear)]
    for name, module in swapped:
        plain = nn.Linear(module.in_features, module.out_features, bias=module.bias is not None, device="meta")
        plain.weight, plain.bias = module.weight, module.bias
        replace_module(model, name, plain)
    return len(swapped)
