"""Fake int8 for quantisation-aware fine-tuning, checked against the reference it imitates: torch's own
``quantize_dynamic`` int8 Linear layer (``torch.ao.quantization``, fbgemm on x86). Straight-through gradients follow
Jacob et al., 2018 (cited from memory)."""

import copy

import pytest
import torch

from engine.reader.transformer_reader import quantize_reader, quantized_layer_names
from engine.training.fake_quant import (
    FakeQuantLinear, apply_fake_quant, fake_quantize_input, fake_quantize_weight, remove_fake_quant,
)


class TinyEncoder(torch.nn.Module):
    """Names shaped like a BERT layer's, so the variants pick the same kinds of layer."""

    def __init__(self):
        super().__init__()
        torch.manual_seed(11)
        self.layer = torch.nn.ModuleDict({
            "attention": torch.nn.ModuleDict({"query": torch.nn.Linear(16, 16), "dense": torch.nn.Linear(16, 16)}),
            "intermediate": torch.nn.ModuleDict({"dense": torch.nn.Linear(16, 64)}),
            "output": torch.nn.ModuleDict({"dense": torch.nn.Linear(64, 16)}),
        })
        self.qa_outputs = torch.nn.Linear(16, 2)

    def forward(self, x):
        a = self.layer["attention"]
        h = a["dense"](a["query"](x))
        h = self.layer["output"]["dense"](torch.relu(self.layer["intermediate"]["dense"](h)))
        return self.qa_outputs(h)


def single_layer(seed: int = 0):
    torch.manual_seed(seed)
    holder = torch.nn.Module()
    holder.dense = torch.nn.Linear(384, 1536)
    x = torch.randn(4, 50, 384) * 2 + 0.3  # off-centre, so the input's zero point is not trivial
    x[2] *= 3  # one window with a wider range: a shared range would coarsen the others
    return holder, x


@pytest.mark.parametrize("mode", ["all", "all-per-channel"])
def test_one_layer_matches_torchs_int8_linear_far_closer_than_fp32_does(mode):
    holder, x = single_layer()
    with torch.no_grad():
        fp32 = holder.dense(x)
        int8_layer = quantize_reader(copy.deepcopy(holder), mode).dense
        int8 = torch.cat([int8_layer(x[i:i + 1]) for i in range(len(x))])  # the reader's int8 reads, one window each
        fake_holder = copy.deepcopy(holder)
        apply_fake_quant(fake_holder, mode)
        fake = fake_holder.dense(x)
    int8_error = (int8 - fp32).abs().mean().item()
    fake_error = (fake - int8).abs().mean().item()
    # Measured: int8 sits 0.025 from fp32; the fake layer sits 4e-6 (per tensor) and 1e-4 (per channel) from int8.
    assert int8_error > 0.01
    assert fake_error < int8_error / 100


def test_weight_grid_is_symmetric_int8_with_one_scale_per_row():
    w = torch.tensor([[1.0, -0.5, 0.26], [0.01, 0.02, -0.03]])
    per_row = fake_quantize_weight(w, per_channel=True)
    # Row 1: s = 1 / 127.5, so 0.26 -> round(33.15) = 33 -> 33 / 127.5; row 2 keeps its own finer scale.
    assert per_row[0, 2].item() == pytest.approx(33 / 127.5)
    # Row 2: s = 0.03 / 127.5, so -0.03 -> round(-127.5) = -128 (half to even, still inside [-128, 127]).
    assert per_row[1, 2].item() == pytest.approx(-128 * 0.03 / 127.5)
    per_tensor = fake_quantize_weight(w, per_channel=False)
    assert per_tensor[1, 0].item() == pytest.approx(1 / 127.5)  # 0.01 * 127.5 = 1.275 -> 1 step of the shared scale


def test_input_grid_has_128_levels_and_keeps_zero_exact():
    x = torch.linspace(-1.0, 3.0, 1001)
    q = fake_quantize_input(x)
    assert len(torch.unique(q)) <= 128  # fbgemm's reduce_range: 7 bits
    assert fake_quantize_input(torch.tensor([0.0, -1.0, 3.0]))[0].item() == 0.0
    assert (q - x).abs().max().item() <= (4.0 / 127) / 2 + 1e-6  # at most half a step off


def test_gradients_pass_straight_through_the_rounding():
    w = torch.randn(8, 8, requires_grad=True)
    x = torch.randn(3, 8, requires_grad=True)
    (fake_quantize_input(x) @ fake_quantize_weight(w, per_channel=True).T).sum().backward()
    # d/dx of sum(x W'^T) with the rounding taken as identity: each row of x gets the column sums of W'.
    expected = fake_quantize_weight(w.detach(), per_channel=True).sum(dim=0).expand(3, 8)
    assert torch.allclose(x.grad, expected, atol=1e-6)
    assert torch.allclose(w.grad, fake_quantize_input(x.detach()).sum(dim=0).expand(8, 8), atol=1e-6)


@pytest.mark.parametrize("mode,count", [("attention", 2), ("all-but-ffn-output", 3), ("all-per-channel", 4),
                                        ("none", 0)])
def test_swaps_exactly_the_layers_inference_quantises_and_back(mode, count):
    model = TinyEncoder()
    keys, before = list(model.state_dict()), model(torch.ones(2, 16)).detach()
    names = apply_fake_quant(model, mode)
    assert names == sorted(quantized_layer_names(TinyEncoder(), mode)) and len(names) == count
    assert all(isinstance(model.get_submodule(n), FakeQuantLinear) for n in names)
    assert "qa_outputs" not in names  # the span head stays fp32, as in quantize_reader
    assert list(model.state_dict()) == keys  # checkpoints and save_pretrained see the same tensors
    assert remove_fake_quant(model) == count
    assert torch.equal(model(torch.ones(2, 16)), before)


def test_unknown_mode_names_the_value():
    with pytest.raises(ValueError, match=r"got 'int4'"):
        apply_fake_quant(TinyEncoder(), "int4")


def test_each_window_of_a_batch_gets_its_own_input_range():
    x = torch.randn(3, 10, 8)
    x[1] *= 50
    batched = fake_quantize_input(x)
    alone = torch.cat([fake_quantize_input(x[i:i + 1]) for i in range(3)])
    assert torch.equal(batched, alone)
