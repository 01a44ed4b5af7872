"""Bias correction after int8 weight rounding (engine.reader.bias_correction).

Source for every check: Nagel et al., 2019, "Data-Free Quantization Through Weight Equalization and Bias
Correction", section 4.2 (cited from memory): with e = W_int8 - W and E[x] the mean input, the quantised layer's
expected output is off by e E[x], and the corrected bias is b - e E[x]. The small tensors below are hand-made inputs
for that formula, not data.
"""

import numpy as np
import pytest

from engine.reader.bias_correction import (
    INPUT_MEANS_FILE,
    corrected_bias,
    load_input_means,
    save_input_means,
)


def test_corrected_bias_worked_example():
    # e = [[0.1, -0.2], [0.0, 0.3]], E[x] = (2, 1): e E[x] = (0.2 - 0.2, 0 + 0.3) = (0, 0.3); b = (1, 1) -> (1, 0.7).
    e = np.array([[0.1, -0.2], [0.0, 0.3]])
    np.testing.assert_allclose(corrected_bias(np.ones(2), e, np.array([2.0, 1.0])), [1.0, 0.7])


def test_corrected_layer_is_exact_on_the_mean_input():
    # For the input x = E[x] itself, (W + e) x + b - e E[x] = W x + b exactly: the corrected layer has no error there.
    rng = np.random.default_rng(0)
    w, e, b, mean = rng.normal(size=(3, 4)), rng.normal(scale=0.01, size=(3, 4)), rng.normal(size=3), rng.normal(size=4)
    np.testing.assert_allclose((w + e) @ mean + corrected_bias(b, e, mean), w @ mean + b, atol=1e-12)


def test_corrected_bias_rejects_mismatched_shapes():
    with pytest.raises(ValueError, match=r"got \(2,\), \(2, 3\) and \(2,\)"):
        corrected_bias(np.ones(2), np.ones((2, 3)), np.ones(2))


def _tiny_model(torch):
    class Tiny(torch.nn.Module):
        def __init__(self):
            super().__init__()
            self.first = torch.nn.Linear(16, 16)
            self.second = torch.nn.Linear(16, 4)

        def forward(self, x):
            return self.second(torch.relu(self.first(x)))

    torch.manual_seed(0)
    return Tiny().eval()


def _inputs_with_a_shifted_mean(torch, rows=256):
    torch.manual_seed(1)
    return torch.randn(1, rows, 16) * 0.2 + 3.0  # far from zero mean, so the rounding error has a systematic part


def test_measured_means_are_the_per_channel_token_means():
    torch = pytest.importorskip("torch")
    from engine.reader.bias_correction import measure_input_means

    model = _tiny_model(torch)
    windows = [{"x": np.random.default_rng(k).normal(size=(3 + k, 16)).astype(np.float32)} for k in range(3)]
    means = measure_input_means(model, windows)
    every_row = np.concatenate([w["x"] for w in windows])
    np.testing.assert_allclose(means["first"], every_row.mean(axis=0), rtol=1e-5, atol=1e-6)
    with torch.no_grad():
        hidden = torch.relu(model.first(torch.from_numpy(every_row))).numpy()
    np.testing.assert_allclose(means["second"], hidden.mean(axis=0), rtol=1e-5, atol=1e-6)
    with pytest.raises(ValueError, match="got 0"):
        measure_input_means(model, [])


def test_bias_correction_removes_the_mean_output_error_of_int8():
    torch = pytest.importorskip("torch")
    import copy

    from engine.reader.bias_correction import measure_input_means
    from engine.reader.transformer_reader import quantize_reader

    model = _tiny_model(torch)
    x = _inputs_with_a_shifted_mean(torch)
    means = measure_input_means(model, [{"x": x[0].numpy()}])
    with torch.inference_mode():
        reference = model(x)
        plain = quantize_reader(copy.deepcopy(model), "all")(x) - reference
        corrected = quantize_reader(copy.deepcopy(model), "all-bias-corrected", means)(x) - reference
    # The mean error per output (over these inputs, whose mean was measured) shrinks; the kernels are the same.
    assert corrected.mean(dim=(0, 1)).abs().mean() < 0.5 * plain.mean(dim=(0, 1)).abs().mean()
    assert corrected.abs().mean() < plain.abs().mean()


def test_corrected_mode_without_means_or_with_wrong_widths_is_refused():
    torch = pytest.importorskip("torch")
    from engine.reader.transformer_reader import quantize_reader

    with pytest.raises(ValueError, match="got None"):
        quantize_reader(_tiny_model(torch), "all-bias-corrected")
    with pytest.raises(ValueError, match=r"first must have 16 channels \(got \(3,\)\)"):
        quantize_reader(_tiny_model(torch), "all-bias-corrected", {"first": np.ones(3, dtype=np.float32)})
    with pytest.raises(ValueError, match=r"first must have 16 channels \(got nothing\)"):
        quantize_reader(_tiny_model(torch), "all-bias-corrected", {})


def test_means_round_trip_through_safetensors_and_a_missing_file_is_named(tmp_path):
    means = {"layer.a": np.array([1.5, -2.0], dtype=np.float32), "layer.b": np.array([0.25], dtype=np.float32)}
    path = save_input_means(means, tmp_path)
    assert path.name == INPUT_MEANS_FILE and not list(tmp_path.glob("*.tmp"))
    loaded = load_input_means(tmp_path)
    assert sorted(loaded) == sorted(means)
    for name, value in means.items():
        np.testing.assert_array_equal(loaded[name], value)
    with pytest.raises(FileNotFoundError, match=INPUT_MEANS_FILE):
        load_input_means(tmp_path / "elsewhere")
