"""Our SQuAD metric against the reference library torchmetrics and hand-computed pairs.

Source of the metric: the official SQuAD v1.1 and v2.0 evaluation scripts (Rajpurkar et al., 2016; 2018).
torchmetrics' ``squad`` implements the v1.1 script.
"""

import pytest
from torchmetrics.functional.text import squad as tm_squad

from engine.metrics import exact_match, f1_v1, f1_v2, normalize_answer, score_v1, score_v2

PAIRS = [
    ("the Eiffel Tower", ["Eiffel Tower"]),
    ("ninety (90) days", ["90 days", "ninety (90) days"]),
    ("the laws of the State of Oregon", ["laws of the State of Oregon"]),
    ("$1,250,000", ["$1,250,000 per year"]),
    ("sixty days prior written notice", ["thirty (30) days"]),
    ("Delaware", ["the State of Delaware", "Delaware law"]),
    ("an assignment", ["assignment consent"]),
]


def test_normalisation_by_hand():
    # v1.1 script: lower, remove punctuation, remove articles, fix whitespace.
    assert normalize_answer("The  Quick, brown-fox!") == "quick brownfox"
    assert normalize_answer("An apple a day") == "apple day"


def test_hand_computed_f1():
    # "ninety days" vs "90 days": common {days}; P = 1/2, R = 1/2 -> F1 = 0.5 (hand-computed).
    assert f1_v1("ninety days", "90 days") == pytest.approx(0.5)
    # "$1,250,000" -> "1250000"; gold "1250000 per year": P = 1, R = 1/3 -> F1 = 0.5 (hand-computed).
    assert f1_v1("$1,250,000", "$1,250,000 per year") == pytest.approx(0.5)
    assert exact_match("The Lessee", "lessee") == 1.0


def test_empty_strings_differ_between_v1_and_v2():
    # v1.1 script: no common tokens -> F1 0, even when both are empty.
    assert f1_v1("", "") == 0.0
    # v2.0 script: if either is empty, F1 = int(both empty).
    assert f1_v2("", "") == 1.0
    assert f1_v2("", "ninety days") == 0.0


def test_matches_torchmetrics_v1():
    preds = [{"prediction_text": p, "id": str(i)} for i, (p, _) in enumerate(PAIRS)]
    target = [{"answers": {"answer_start": [0] * len(g), "text": g}, "id": str(i)} for i, (_, g) in enumerate(PAIRS)]
    reference = tm_squad(preds, target)
    ours = score_v1({str(i): p for i, (p, _) in enumerate(PAIRS)}, {str(i): g for i, (_, g) in enumerate(PAIRS)})
    assert ours.exact == pytest.approx(float(reference["exact_match"]), abs=1e-4)
    assert ours.f1 == pytest.approx(float(reference["f1"]), abs=1e-4)


def test_v2_splits_has_and_no_answer():
    golds = {"a": ["90 days"], "b": [], "c": []}
    preds = {"a": "90 days", "b": "", "c": "Oregon"}
    scores = score_v2(preds, golds)
    assert scores.has_ans_exact == 100.0 and scores.no_ans_exact == 50.0
    assert scores.exact == pytest.approx(200 / 3)
    assert scores.has_ans_total == 1 and scores.no_ans_total == 2


def test_missing_prediction_scores_zero_and_bad_input_raises():
    assert score_v1({}, {"q": ["x"]}).f1 == 0.0
    with pytest.raises(ValueError, match=r"\(got"):
        score_v1({}, {})


def test_paired_bootstrap_interval_matches_the_normal_approximation():
    """Paired bootstrap (Efron and Tibshirani, 1993). For 400 differences that are half 0 and half 1, the mean is
    0.5 and the central limit theorem gives a 95 % interval of 0.5 +/- 1.96 * sqrt(0.25 / 400) = [0.451, 0.549]."""
    from engine.evaluation import paired_bootstrap

    old = [0.0] * 400
    new = [0.0, 1.0] * 200
    gain, low, high = paired_bootstrap(old, new, resamples=4000, seed=1)
    assert gain == pytest.approx(0.5)
    assert low == pytest.approx(0.451, abs=0.006) and high == pytest.approx(0.549, abs=0.006)
    # A constant gain leaves nothing to resample: the interval collapses onto it.
    assert paired_bootstrap([0.2, 0.4, 0.6], [0.3, 0.5, 0.7]) == pytest.approx((0.1, 0.1, 0.1))
    with pytest.raises(ValueError, match=r"got \(2,\) and \(3,\)"):
        paired_bootstrap([0.1, 0.2], [0.1, 0.2, 0.3])


def test_paired_bootstrap_agrees_with_scipy():
    """Reference library: scipy.stats.bootstrap, percentile method, on the same paired differences."""
    import numpy as np
    from scipy import stats

    from engine.evaluation import paired_bootstrap

    rng = np.random.default_rng(5)
    old = rng.uniform(0, 1, 300)
    new = np.clip(old + rng.normal(0.03, 0.3, 300), 0, 1)
    gain, low, high = paired_bootstrap(old, new, resamples=4000, seed=2)
    reference = stats.bootstrap((new - old,), np.mean, n_resamples=4000, method="percentile",
                                random_state=3).confidence_interval
    assert gain == pytest.approx(float(np.mean(new - old)))
    assert low == pytest.approx(reference.low, abs=0.006) and high == pytest.approx(reference.high, abs=0.006)


def test_stratified_bootstrap_weights_sets_equally_and_matches_the_stratified_normal_approximation():
    """Stratified bootstrap (Efron and Tibshirani, 1993, section 6.8). The estimate is the plain average of the
    per-set mean differences, whatever the set sizes. Its standard error is the stratified-sampling formula
    (1/S) * sqrt(sum of var_s / n_s), the variance of a stratified mean with equal weights (Cochran, 1977,
    "Sampling Techniques", chapter 5; cited from memory): for a set of
    400 differences half 0 and half 1 (variance 0.25) and a set of 100 constant differences of 0.2, the mean is
    (0.5 + 0.2) / 2 = 0.35 and the 95 % interval is 0.35 +/- 1.96 * 0.5 * sqrt(0.25 / 400) = [0.3255, 0.3745]."""
    from engine.evaluation import stratified_paired_bootstrap

    strata = [([0.0] * 400, [0.0, 1.0] * 200), ([0.5] * 100, [0.7] * 100)]
    mean, low, high = stratified_paired_bootstrap(strata, resamples=4000, seed=1)
    assert mean == pytest.approx(0.35)
    assert low == pytest.approx(0.3255, abs=0.004) and high == pytest.approx(0.3745, abs=0.004)
    # Constant differences of 1 (10 questions) and 3 (1,000 questions): equal weights give 2, not the pooled 2.98.
    assert stratified_paired_bootstrap([([0.0] * 10, [1.0] * 10), ([0.0] * 1000, [3.0] * 1000)]) == pytest.approx(
        (2.0, 2.0, 2.0))
    with pytest.raises(ValueError, match=r"got 0"):
        stratified_paired_bootstrap([])
