"""Tests for the synthetic contract generator.

Everything generated here is invented training data (no real parties). The format checks follow the
SQuAD JSON conventions: answer offsets index the context exactly (SQuAD v1.1, Rajpurkar et al. 2016,
"SQuAD: 100,000+ Questions for Machine Comprehension of Text") and unanswerable questions carry
is_impossible=True with an empty answer list (SQuAD 2.0, Rajpurkar, Jia & Liang 2018, "Know What You
Don't Know: Unanswerable Questions for SQuAD").
"""

from __future__ import annotations

import gzip
import json
import statistics

import pytest

from engine.training.synth_contracts import (
    _KINDS,
    generate_squad,
    generate_windows,
    main,
    number_words,
)

N = 500


@pytest.fixture(scope="module")
def squad() -> dict:
    return generate_squad(N, seed=7)


@pytest.fixture(scope="module")
def windows():
    return generate_windows(N, seed=7)


def _qas(squad: dict):
    for d in squad["data"]:
        for p in d["paragraphs"]:
            for qa in p["qas"]:
                yield p["context"], qa


def test_schema_and_offsets_invariant(squad):
    # SQuAD v1.1 (Rajpurkar et al. 2016): context[answer_start:answer_start+len(text)] == text.
    # SQuAD 2.0 (Rajpurkar et al. 2018): is_impossible=True <=> answers == [].
    assert squad["version"] == "synthetic-contracts-1"
    n_paragraphs = sum(len(d["paragraphs"]) for d in squad["data"])
    assert n_paragraphs == N
    ids = set()
    for context, qa in _qas(squad):
        assert context.strip() and qa["question"].strip()
        assert "{" not in context and "{" not in qa["question"]  # no unfilled template field (project check)
        assert qa["id"] not in ids
        ids.add(qa["id"])
        assert qa["is_impossible"] == (qa["answers"] == [])
        for a in qa["answers"]:
            assert a["text"]
            assert context[a["answer_start"]:a["answer_start"] + len(a["text"])] == a["text"]


def test_answers_sit_in_their_own_clause(windows):
    # Project invariant: when the same value occurs more than once, the offset points into the asked-about clause.
    repeated = 0
    for w in windows:
        spans = {c.kind: (c.start, c.end) for c in w.clauses}
        for q in w.questions:
            if q.answer is None:
                continue
            text, start = q.answer
            lo, hi = spans[q.kind]
            assert lo <= start and start + len(text) <= hi
            repeated += w.context.count(text) > 1
    assert repeated > 0  # the generator does produce repeated values (project check)


def test_unanswerable_are_absent(windows):
    # An unanswerable question asks about a slot that no clause of the window fills (project invariant).
    for w in windows:
        kinds = {c.kind for c in w.clauses}
        for q in w.questions:
            if q.answer is None:
                assert q.slot not in w.filled
                assert q.kind not in kinds or q.slot.startswith("absent_") or q.slot in _KINDS[q.kind][2]
            else:
                assert q.slot in w.filled
    n_near = sum(q.answer is None and q.kind in {c.kind for c in w.clauses} for w in windows for q in w.questions)
    assert n_near > 0  # some unanswerable questions are near misses inside a present clause (project check)


def test_deterministic():
    # Same seed -> identical JSON; different seed -> different data (project requirement).
    assert json.dumps(generate_squad(50, 3)) == json.dumps(generate_squad(50, 3))
    assert json.dumps(generate_squad(50, 3)) != json.dumps(generate_squad(50, 4))


def test_unanswerable_fraction(squad):
    # Target about 20% unanswerable (project choice; SQuAD 2.0 itself is about one third, Rajpurkar et al. 2018).
    flags = [qa["is_impossible"] for _, qa in _qas(squad)]
    assert 0.12 <= sum(flags) / len(flags) <= 0.30


def test_unique_contexts():
    # Project requirement: > 95% distinct contexts over 2,000 windows.
    contexts = [w.context for w in generate_windows(2000, seed=11)]
    assert len(set(contexts)) / len(contexts) > 0.95


def test_short_answers_and_window_size(squad):
    # Short-answer target (common practice, no source): median answer shorter than 40 characters.
    lengths = [len(a["text"]) for _, qa in _qas(squad) for a in qa["answers"]]
    assert statistics.median(lengths) < 40
    # Windows of roughly 120-220 words (project spec); allow a little slack at the edges.
    words = [len(p["context"].split()) for d in squad["data"] for p in d["paragraphs"]]
    assert min(words) >= 100 and max(words) <= 260
    assert sum(120 <= n <= 220 for n in words) / len(words) > 0.9


def test_variety(windows):
    # Project requirement: at least 15 clause kinds with at least 3 phrasings, all of them used.
    kinds = [k for k, (_, tpls, _) in _KINDS.items() if len(tpls) >= 3]
    assert len(kinds) >= 15
    used = {c.kind for w in windows for c in w.clauses}
    assert set(_KINDS) <= used
    questions = {q.question for w in windows for q in w.questions}
    assert any(q == q.lower() and not q.endswith("?") for q in questions)


def test_number_words():
    # English cardinal spelling (from memory): 90 -> "ninety", 245 -> "two hundred forty-five".
    assert number_words(90) == "ninety"
    assert number_words(245) == "two hundred forty-five"
    assert number_words(1_250_000) == "one million two hundred fifty thousand"
    with pytest.raises(ValueError):
        number_words(-1)


def test_bad_arguments():
    with pytest.raises(ValueError):
        generate_squad(0)
    with pytest.raises(ValueError):
        generate_squad(5, seed="x")  # type: ignore[arg-type]


def test_main_writes_gzip(tmp_path):
    out = tmp_path / "s.json.gz"
    assert main([str(out), "20", "1"]) == 0
    with gzip.open(out, "rt", encoding="utf-8") as f:
        assert json.load(f) == generate_squad(20, 1)
