"""Activation smoothing before int8 (engine.reader.smoothing).

Source for every check: Xiao et al., 2023, "SmoothQuant: Accurate and Efficient Post-Training Quantization for
Large Language Models", section 4 (cited from memory): s_j = max|X_j|^alpha / max|W_j|^(1 - alpha), and
Y = (X diag(s)^-1)(diag(s) W) is the same product as X W. The small tensors below are hand-made inputs for those
formulas, not data.
"""

import numpy as np
import pytest

from engine.reader.smoothing import (
    ACTIVATION_RANGES_FILE,
    load_activation_ranges,
    save_activation_ranges,
    smoothing_scales,
)


def test_scales_worked_example_balances_both_ranges_at_alpha_half():
    # a = (4, 1), w = (1, 4): s = (sqrt(4)/sqrt(1), sqrt(1)/sqrt(4)) = (2, 0.5); after smoothing both the activation
    # range a/s and the weight range w*s are sqrt(a*w) = 2 in every channel.
    a, w = np.array([4.0, 1.0]), np.array([1.0, 4.0])
    s = smoothing_scales(a, w, alpha=0.5)
    np.testing.assert_allclose(s, [2.0, 0.5])
    np.testing.assert_allclose(a / s, [2.0, 2.0])
    np.testing.assert_allclose(w * s, [2.0, 2.0])


def test_scales_at_the_ends_of_alpha():
    a, w = np.array([8.0, 0.5]), np.array([2.0, 0.25])
    np.testing.assert_allclose(smoothing_scales(a, w, alpha=1.0), a)  # all range moves to the weights
    np.testing.assert_allclose(smoothing_scales(a, w, alpha=0.0), 1.0 / w)  # weights normalised, inputs take it


def test_scales_floor_silent_channels_instead_of_dividing_by_zero():
    s = smoothing_scales(np.array([0.0, 2.0]), np.array([0.0, 2.0]))
    assert np.isfinite(s).all() and (s > 0).all()


@pytest.mark.parametrize("alpha", [-0.1, 1.5])
def test_scales_reject_alpha_outside_zero_one(alpha):
    with pytest.raises(ValueError, match=rf"got {alpha}"):
        smoothing_scales(np.ones(2), np.ones(2), alpha=alpha)


def test_scales_reject_mismatched_or_negative_ranges():
    with pytest.raises(ValueError, match=r"got \(2,\) and \(3,\)"):
        smoothing_scales(np.ones(2), np.ones(3))
    with pytest.raises(ValueError, match="cannot be negative"):
        smoothing_scales(np.array([1.0, -1.0]), np.ones(2))


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


def _inputs_with_an_outlier_channel(torch, rows=64):
    torch.manual_seed(1)
    x = torch.randn(1, rows, 16)
    x[..., 3] *= 60.0  # one channel far wider than the rest: the case smoothing is for
    return x


def test_measured_ranges_are_the_per_channel_absolute_maxima():
    torch = pytest.importorskip("torch")
    from engine.reader.smoothing import measure_activation_ranges

    model = _tiny_model(torch)
    windows = [{"x": np.random.default_rng(k).normal(size=(5, 16)).astype(np.float32)} for k in range(3)]
    ranges = measure_activation_ranges(model, windows)
    expected_first = np.max([np.abs(w["x"]).max(axis=0) for w in windows], axis=0)
    np.testing.assert_allclose(ranges["first"], expected_first, rtol=1e-6)
    with torch.no_grad():
        hidden = [torch.relu(model.first(torch.from_numpy(w["x"]))).abs().amax(dim=0).numpy() for w in windows]
    np.testing.assert_allclose(ranges["second"], np.max(hidden, axis=0), rtol=1e-6)
    with pytest.raises(ValueError, match="got 0"):
        measure_activation_ranges(model, [])


def test_smoothing_keeps_the_fp32_product_and_cuts_int8_error():
    torch = pytest.importorskip("torch")
    import copy

    from engine.reader.smoothing import measure_activation_ranges, smooth_linears
    from engine.reader.transformer_reader import quantize_reader

    model = _tiny_model(torch)
    x = _inputs_with_an_outlier_channel(torch)
    ranges = measure_activation_ranges(model, [{"x": x[0].numpy()}])
    with torch.inference_mode():
        reference = model(x)
        smoothed = copy.deepcopy(model)
        inner = smooth_linears(smoothed, ["first", "second"], ranges)
        assert inner == ["first.linear", "second.linear"]
        np.testing.assert_allclose(smoothed(x).numpy(), reference.numpy(), rtol=1e-4, atol=1e-4)
        error_plain = (quantize_reader(copy.deepcopy(model), "all") (x) - reference).abs().mean()
        error_smooth = (quantize_reader(copy.deepcopy(model), "all-smoothed", ranges)(x) - reference).abs().mean()
    assert error_smooth < error_plain


def test_smoothed_mode_without_ranges_or_with_wrong_widths_is_refused():
    torch = pytest.importorskip("torch")
    from engine.reader.smoothing import smooth_linears
    from engine.reader.transformer_reader import quantize_reader

    with pytest.raises(ValueError, match="got None"):
        quantize_reader(_tiny_model(torch), "all-smoothed")
    with pytest.raises(ValueError, match=r"first must have 16 channels \(got \(3,\)\)"):
        smooth_linears(_tiny_model(torch), ["first"], {"first": np.ones(3, dtype=np.float32)})
    with pytest.raises(ValueError, match=r"second must have 16 channels \(got nothing\)"):
        smooth_linears(_tiny_model(torch), ["second"], {})


def test_ranges_round_trip_through_safetensors_and_a_missing_file_is_named(tmp_path):
    ranges = {"layer.a": np.array([1.5, 2.0], dtype=np.float32), "layer.b": np.array([0.25], dtype=np.float32)}
    path = save_activation_ranges(ranges, tmp_path)
    assert path.name == ACTIVATION_RANGES_FILE and not list(tmp_path.glob("*.tmp"))
    loaded = load_activation_ranges(tmp_path)
    assert sorted(loaded) == sorted(ranges)
    for name, value in ranges.items():
        np.testing.assert_array_equal(loaded[name], value)
    with pytest.raises(FileNotFoundError, match=ACTIVATION_RANGES_FILE):
        load_activation_ranges(tmp_path / "elsewhere")
