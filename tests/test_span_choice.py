"""The expected-F1 span choice (engine.reader.span_choice) and how readings carry it.

Every expected value below is computed by hand from the SQuAD v1.1 token F1 (Rajpurkar et al., 2016: the official
evaluation script's normalisation, then word-overlap precision and recall) and E[F1](c_i) = sum_j p_j F1(c_i, c_j)
with p = softmax(scores), as written in the module docstring.
"""

import math

import numpy as np
import pytest

from engine.reader.interface import Reading, ReadSpan
from engine.metrics import f1_v1
from engine.reader.span_choice import choose_span, expected_f1, pairwise_token_f1
from engine.reader.transformer_reader import collect_readings
from engine.reader.windows import Window

THIRTY, NINETY, NOTICE = "thirty (30) days", "ninety (90) days", "ninety (90) days' prior written notice"


def test_worked_example_prefers_the_span_the_others_agree_with():
    # p = (0.4, 0.3, 0.3). F1(THIRTY, NINETY) = 1/3 ("days"); F1(THIRTY, NOTICE) = 2/9 (P 1/3, R 1/6);
    # F1(NINETY, NOTICE) = 2/3 (P 1, R 1/2).
    # E = (0.4 + 0.3/3 + 0.3*2/9, 0.4/3 + 0.3 + 0.3*2/3, 0.4*2/9 + 0.3*2/3 + 0.3) = (0.5667, 0.6333, 0.5889).
    scores = [math.log(4), math.log(3), math.log(3)]
    got = expected_f1([THIRTY, NINETY, NOTICE], scores)
    assert got == pytest.approx([0.4 + 0.1 + 0.6 / 9, 0.4 / 3 + 0.3 + 0.2, 0.8 / 9 + 0.2 + 0.3])
    assert choose_span([THIRTY, NINETY, NOTICE], scores) == 1  # not the top-scored THIRTY


def test_a_dominant_span_and_ties_keep_the_first():
    assert choose_span([THIRTY, NINETY], [20.0, 0.0]) == 0
    assert choose_span([NINETY, NINETY], [1.0, 1.0]) == 0
    assert choose_span([THIRTY], [-3.0]) == 0
    assert expected_f1([], []).shape == (0,)


def test_temperature_flattens_the_belief():
    # T -> infinity makes p uniform: E = row means of the F1 matrix (1, 1/3, 2/9 / 1/3, 1, 2/3 / 2/9, 2/3, 1).
    got = expected_f1([THIRTY, NINETY, NOTICE], [5.0, 0.0, 0.0], temperature=1e9)
    assert got == pytest.approx([(1 + 1 / 3 + 2 / 9) / 3, 2 / 3, (2 / 9 + 2 / 3 + 1) / 3])


@pytest.mark.parametrize("texts, scores, temperature, message", [
    ([THIRTY], [1.0], 0.0, "temperature must be > 0 (got 0.0)"),
    ([THIRTY], [1.0, 2.0], 1.0, "one score per text is needed (got 1 and 2)"),
    ([THIRTY], [float("nan")], 1.0, "scores must be finite"),
])
def test_bad_arguments_raise(texts, scores, temperature, message):
    with pytest.raises(ValueError, match=message.replace("(", r"\(").replace(")", r"\)")):
        expected_f1(texts, scores, temperature)
    with pytest.raises(ValueError, match="got 0"):
        choose_span([], [])


CONTEXT = "ninety days prior notice"
#            [CLS]    q      [SEP]   ninety   days     prior     notice    [SEP]
OFFSETS = ((0, 0), (0, 0), (0, 0), (0, 6), (7, 11), (12, 17), (18, 24), (0, 0))
MASK = (False, False, False, True, True, True, True, False)


def test_a_reading_answers_with_the_choice_and_keeps_the_best_score_as_its_margin():
    # Only starts at "ninety"/"notice" and ends at "days"/"notice" are plausible (-50 elsewhere), so the belief is
    # p("notice") = 0.4, p("ninety days") = 0.3, p("ninety days prior notice") = 0.3 (other spans ~e-50).
    # F1("notice", "ninety days") = 0; F1("notice", whole) = 0.4 (P 1, R 1/4); F1("ninety days", whole) = 2/3.
    # E = (0.4 + 0.12, 0.3 + 0.2, 0.16 + 0.2 + 0.3) = (0.52, 0.50, 0.66): the whole clause is the answer.
    low = -50.0
    start = np.array([1.0, low, low, 0.0, low, low, math.log(4 / 3), low])
    end = np.array([1.0, low, low, low, math.log(3), low, math.log(3), low])
    window = Window(0, (0,) * 8, (0,) * 8, OFFSETS, MASK)
    (reading,) = collect_readings([("how much notice?", CONTEXT)], [window], [(start, end)], n_best=3,
                                  max_answer_tokens=4)
    assert [s.text for s in reading.spans] == ["ninety days prior notice", "notice", "ninety days"]
    assert reading.spans[0].score == pytest.approx(math.log(3))  # each span keeps its own score
    assert reading.null_score == 2.0 and reading.best_score == pytest.approx(math.log(4))
    assert reading.margin(0) == pytest.approx(math.log(4) - 2.0)  # the pair's margin: best score - null
    assert reading.margin(1) == pytest.approx(math.log(4) - 2.0) and reading.margin(2) == pytest.approx(math.log(3) - 2)
    with pytest.raises(ValueError, match="got 3 for 3 spans"):
        reading.margin(3)
    with pytest.raises(ValueError, match="got 0 and 20"):
        collect_readings([("q", CONTEXT)], [window], [(start, end)], n_best=0, max_answer_tokens=4)


def test_a_reading_without_spans_has_no_best_score():
    assert Reading((), 1.0, 1).best_score == float("-inf")
    assert Reading((ReadSpan(0, 6, "ninety", 2.5),), 1.0, 1).margin(0) == 1.5


def test_pairwise_matrix_equals_the_official_f1_pair_by_pair():
    # Reference: engine.metrics.f1_v1 (the official v1.1 script's F1, itself checked against torchmetrics).
    texts = [THIRTY, NINETY, NOTICE, "the days, the days", "", "Notice!", "prior notice prior"]
    got = pairwise_token_f1(texts)
    assert got == pytest.approx(np.array([[f1_v1(a, b) for b in texts] for a in texts]), abs=1e-12)


def test_one_candidate_or_a_cold_temperature_keeps_the_top_scored_span():
    # Same logits as above. With candidates=1 the choice is the top-scored span itself. At T = 0.1 the belief is
    # p ∝ exp(10 s): p("notice") = e^(10 ln(4/3)) / (e^(10 ln(4/3)) + 2) = 17.76 / 19.76 = 0.899, the others 0.051
    # each, so E("notice") = 0.899 + 0.051 * 0.4 = 0.919 beats E(whole) = 0.899 * 0.4 + 0.051 * (2/3 + 1) = 0.444.
    low = -50.0
    start = np.array([1.0, low, low, 0.0, low, low, math.log(4 / 3), low])
    end = np.array([1.0, low, low, low, math.log(3), low, math.log(3), low])
    window = Window(0, (0,) * 8, (0,) * 8, OFFSETS, MASK)
    pairs = [("how much notice?", CONTEXT)]
    for candidates, temperature in ((1, 1.0), (20, 0.1)):
        (reading,) = collect_readings(pairs, [window], [(start, end)], n_best=3, max_answer_tokens=4,
                                      candidates=candidates, temperature=temperature)
        assert reading.spans[0].text == "notice"
    with pytest.raises(ValueError, match=r"temperature must be > 0 \(got 0.0\)"):
        collect_readings(pairs, [window], [(start, end)], n_best=3, max_answer_tokens=4, temperature=0.0)
