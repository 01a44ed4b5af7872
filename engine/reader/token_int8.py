"""int8 Linear layers with one input scale per token and one weight scale per output channel.

For an input row x (one token) and weight W (out x in):

    y = (q(x) @ q(W)^T) * s_x * s_w + b,   s_x = max_j |x_j| / 127,   s_w[o] = max_j |W[o, j]| / 127,
    q(v) = clamp(round(v / s), -127, 127) as int8, the product summed in int32 (``torch._int_mm``).

This is vector-wise quantisation (Dettmers et al., 2022, "LLM.int8()", section 3.1: row-wise scales for the
activations, column-wise for the weights) with ZeroQuant's token-wise activation scales (Yao et al., 2022); both
cited from memory. torch's ``quantize_dynamic`` takes one input range for the whole tensor instead, so one token
with large values (BERT's [CLS] and [SEP] carry such outliers) costs every other token its precision.

Invariant: each token row is scaled on its own, so a window's output never depends on the other windows in the batch
(nor on padding), and these layers may batch freely.
"""

from __future__ import annotations

import torch
from torch import nn

from engine.reader.transformer_reader import replace_module

INT8_LEVELS = 127  # symmetric: -127..127, so that round(v / s) never needs -128
_TINY = 1e-12  # scale floor for an all-zero row or input; its product is then exactly zero


def per_row_scales(values: torch.Tensor) -> torch.Tensor:
    """max |row| / 127 per row, as a column (rows x 1), never below a tiny floor."""
    return values.abs().amax(dim=1, keepdim=True).clamp_min(_TINY) / INT8_LEVELS


def to_int8(values: torch.Tensor, scales: torch.Tensor) -> torch.Tensor:
    return torch.round(values / scales).clamp_(-INT8_LEVELS, INT8_LEVELS).to(torch.int8)


class TokenInt8Linear(nn.Module):
    """A frozen Linear computed in int8 with per-token input scales and per-channel weight scales."""

    def __init__(self, source: nn.Linear) -> None:
        super().__init__()
        weight = source.weight.detach().float()
        scales = per_row_scales(weight)  # out x 1
        self.in_features, self.out_features = source.in_features, source.out_features
        self.register_buffer("weight_int8_t", to_int8(weight, scales).t().contiguous())  # in x out
        self.register_buffer("weight_scale", scales.reshape(1, -1).contiguous())  # 1 x out
        bias = source.bias.detach().float() if source.bias is not None else torch.zeros(source.out_features)
        self.register_buffer("bias", bias.contiguous())

    def forward(self, x: torch.Tensor) -> torch.Tensor:
        rows = x.reshape(-1, self.in_features).float()
        scales = per_row_scales(rows)
        out = torch._int_mm(to_int8(rows, scales), self.weight_int8_t).float()
        out.mul_(scales).mul_(self.weight_scale).add_(self.bias)
        return out.reshape(*x.shape[:-1], self.out_features).to(x.dtype)

    def extra_repr(self) -> str:
        return f"in_features={self.in_features}, out_features={self.out_features}, int8 per token"


def swap_in_token_int8(model: nn.Module, names: set[str]) -> nn.Module:
    """Replace each named Linear of ``model`` by a ``TokenInt8Linear``, in place; returns the model."""
    for name in sorted(names):
        replace_module(model, name, TokenInt8Linear(model.get_submodule(name)))
    return model
