"""Per-token int8 Linear layers (engine.reader.token_int8) against the published vector-wise formula.

Reference: Dettmers et al., 2022, "LLM.int8()", section 3.1 (vector-wise quantisation: one scale per row of the
input, one per output row of the weight, int32 accumulation, then the outer product of the scales), cited from
memory; computed here independently in float64 numpy.
"""

import copy

import numpy as np
import pytest
import torch

from engine.reader.token_int8 import TokenInt8Linear, swap_in_token_int8


def vector_wise_reference(x: np.ndarray, w: np.ndarray, b: np.ndarray) -> np.ndarray:
    sx = np.abs(x).max(axis=1, keepdims=True) / 127.0
    sw = np.abs(w).max(axis=1, keepdims=True) / 127.0
    qx = np.clip(np.round(x / sx), -127, 127)
    qw = np.clip(np.round(w / sw), -127, 127)
    return (qx @ qw.T) * sx * sw.T + b


@pytest.mark.parametrize("rows", [1, 7, 37])
def test_token_int8_linear_matches_the_vector_wise_formula(rows):
    torch.manual_seed(3)
    linear = torch.nn.Linear(48, 24)
    x = torch.randn(rows, 48)
    expected = vector_wise_reference(x.double().numpy(), linear.weight.detach().double().numpy(),
                                     linear.bias.detach().double().numpy())
    with torch.inference_mode():
        got = TokenInt8Linear(linear)(x).double().numpy()
    # float32 scaling after an exact int32 sum: agreement to float32 rounding, far below one int8 step's effect.
    assert np.abs(got - expected).max() < 1e-4


def test_one_outlier_token_costs_the_other_tokens_nothing():
    """A token with 50x larger values widens torch's one per-tensor input range; per-token scales keep the others'
    precision (the motivation in LLM.int8(), section 3; from memory)."""
    from torch.ao.quantization import per_channel_dynamic_qconfig, quantize_dynamic

    torch.manual_seed(5)
    holder = torch.nn.Sequential(torch.nn.Linear(64, 32))
    x = torch.randn(16, 64)
    x[0] *= 50.0
    with torch.inference_mode():
        exact = holder(x)[1:]
        per_token = TokenInt8Linear(holder[0])(x)[1:]
        per_tensor = quantize_dynamic(copy.deepcopy(holder), {"0": per_channel_dynamic_qconfig},
                                      dtype=torch.qint8)(x)[1:]
    token_error = (per_token - exact).abs().mean().item()
    tensor_error = (per_tensor - exact).abs().mean().item()
    assert token_error * 5 < tensor_error


def test_rows_are_scaled_alone_and_a_zero_row_gives_the_bias():
    torch.manual_seed(8)
    layer = TokenInt8Linear(torch.nn.Linear(16, 8))
    x = torch.randn(4, 16)
    x[2] = 0.0
    with torch.inference_mode():
        together = layer(x)
        alone = torch.cat([layer(x[i:i + 1]) for i in range(4)])
        batched_3d = layer(x.reshape(2, 2, 16)).reshape(4, 8)
    assert torch.equal(together, alone) and torch.equal(together, batched_3d)
    assert torch.equal(together[2], layer.bias)


def test_swap_replaces_only_the_named_layers():
    model = torch.nn.Sequential(torch.nn.Linear(8, 8), torch.nn.ReLU(), torch.nn.Linear(8, 2))
    swap_in_token_int8(model, {"0"})
    assert isinstance(model[0], TokenInt8Linear) and type(model[2]) is torch.nn.Linear
