"""The no-answer threshold search, on hand-made predictions, scored with the SQuAD v2.0 rule (Rajpurkar et al.,
2018: an unanswerable question scores 1 only for the empty prediction)."""

import pytest

from engine.calibration import Calibration, load_calibration
from engine.evaluation import Prediction
from engine.squad_data import GoldAnswer, SquadExample
from engine.training.calibrate import best_threshold


def ex(qid, answer):
    answers = (GoldAnswer(answer, 0),) if answer else ()
    return SquadExample(qid, "", "q", answer or "ctx", answers, not answers)


def test_threshold_separates_answerable_from_unanswerable():
    examples = [ex("a", "ninety days"), ex("b", "Oregon"), ex("c", None), ex("d", None)]
    # null - best margins: answerable ones low, unanswerable ones high.
    predictions = {
        "a": Prediction("ninety days", "ninety days", 5.0, 1.0),  # margin -4
        "b": Prediction("Oregon", "Oregon", 3.0, 2.0),  # margin -1
        "c": Prediction("Lot 7", "Lot 7", 1.0, 3.0),  # margin 2
        "d": Prediction("Lot 9", "Lot 9", 0.0, 4.0),  # margin 4
    }
    threshold, f1 = best_threshold(predictions, examples)
    # Any threshold in [-1, 2) answers a and b and abstains on c and d: v2.0 F1 = 100 (hand-computed).
    assert -1.0 <= threshold < 2.0
    assert f1 == pytest.approx(100.0)


def test_calibration_defaults_and_confidence_curve(tmp_path):
    assert load_calibration(tmp_path) == Calibration()
    c = Calibration(confidence_slope=2.0, confidence_intercept=-1.0)
    assert c.confidence(0.5) == pytest.approx(0.5)  # sigmoid(2 * 0.5 - 1) = sigmoid(0)
    assert 0.0 < c.confidence(-100) < c.confidence(0) < c.confidence(100) <= 1.0
