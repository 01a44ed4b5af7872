"""Bm25Index at 1k and 20k passages of contract text, checked against rank-bm25 0.2.2 (reference library).

Complements tests/test_bm25.py (invented words, rankings at 1k/20k): here the passages are invented contract
clauses (engine.training.synth_contracts) run through the engine's own tokenizer, and the checks cover
scores as well as rankings, queries scoped to a subset of passages, and the .npz round trip at 20k.
Tolerance 1e-6 on scores is the project's requirement (no source). No timing is asserted here.
"""

from __future__ import annotations

import numpy as np
import pytest
from rank_bm25 import BM25Okapi

from engine.bm25 import Bm25Index
from engine.text_tokens import tokenize_for_search
from engine.training.synth_contracts import generate_windows

TOL = 1e-6


def _reference_order(ref_scores: np.ndarray, ids: np.ndarray, k: int) -> np.ndarray:
    """``ids`` ordered by rank-bm25 score descending, ties by lower position (Bm25Index.top_k's documented rule)."""
    ids = np.asarray(ids, dtype=np.int64)
    return ids[np.lexsort((ids, -ref_scores[ids]))][:k]


def _queries(n: int, seed: int, corpus: list[list[str]]) -> list[list[str]]:
    """Contract questions from the generator, plus edge cases: the most common term (its idf is floored to
    epsilon * mean idf), a repeated term, an unknown term, an empty query."""
    questions = [q.question for w in generate_windows(n, seed=seed) for q in w.questions]
    out = [tokenize_for_search(q) for q in questions[:n]]
    df: dict[str, int] = {}
    for doc in corpus:
        for t in set(doc):
            df[t] = df.get(t, 0) + 1
    common = max(df, key=lambda t: (df[t], t))
    assert df[common] > len(corpus) / 2  # negative raw idf, so the floor is exercised
    out += [[common], [common, "termin", "termin", "no-such-term"], ["no-such-term"], []]
    return out


@pytest.fixture(scope="module")
def corpus_1k() -> list[list[str]]:
    return [tokenize_for_search(w.context) for w in generate_windows(1_000, seed=11)]


@pytest.fixture(scope="module")
def corpus_20k() -> list[list[str]]:
    """20,000 passages: random runs of 30-150 tokens cut from 2,000 tokenised invented clause windows."""
    pool = [tokenize_for_search(w.context) for w in generate_windows(2_000, seed=12)]
    rng = np.random.default_rng(12)
    out = []
    for _ in range(20_000):
        a, b = rng.integers(len(pool), size=2)
        joined = pool[a] + pool[b]
        n = int(rng.integers(30, 151))
        lo = int(rng.integers(0, max(1, len(joined) - n)))
        out.append(joined[lo : lo + n])
    return out


@pytest.fixture(scope="module")
def built_20k(corpus_20k):
    return Bm25Index.build(corpus_20k), BM25Okapi(corpus_20k)


def test_top_100_and_scores_equal_rank_bm25_on_1k_contract_passages(corpus_1k):
    ours, ref = Bm25Index.build(corpus_1k), BM25Okapi(corpus_1k)
    # Reference library: rank_bm25.BM25Okapi.average_idf (rank-bm25 0.2.2).
    assert ours.average_idf == pytest.approx(ref.average_idf, abs=TOL)
    everyone = np.arange(len(corpus_1k))
    for q in _queries(20, 21, corpus_1k):
        ref_scores = ref.get_scores(q)
        # Reference library: rank_bm25.BM25Okapi.get_scores (rank-bm25 0.2.2), every passage.
        np.testing.assert_allclose(ours.scores(q), ref_scores, rtol=0, atol=TOL)
        top = ours.top_k(q, 100, drop_zero=False)
        expected = _reference_order(ref_scores, everyone, 100)
        # Reference library: ranking by rank-bm25 0.2.2 scores (ties by lower position).
        assert [p for p, _ in top] == expected.tolist()
        np.testing.assert_allclose([s for _, s in top], ref_scores[expected], rtol=0, atol=TOL)


def _scopes(n: int) -> list[np.ndarray]:
    """A document-like block, a folder-like union of blocks, a random 10% subset, one passage, nothing."""
    rng = np.random.default_rng(5)
    blocks = np.concatenate([np.arange(s, s + 35) for s in (120, 7_000, 15_500)])
    return [np.arange(4_000, 4_036), blocks, np.sort(rng.choice(n, size=n // 10, replace=False)),
            np.array([n - 1]), np.array([], dtype=np.int64)]


def test_scoped_queries_equal_masked_rank_bm25_at_20k(corpus_20k, built_20k):
    ours, ref = built_20k
    n = len(corpus_20k)
    for q in _queries(8, 22, corpus_20k):
        ref_scores = ref.get_scores(q)
        for ids in _scopes(n):
            mask = np.zeros(n, dtype=bool)
            mask[ids] = True
            # Reference library: rank_bm25.BM25Okapi.get_scores (rank-bm25 0.2.2), zeroed outside the scope.
            np.testing.assert_allclose(ours.scores(q, candidate_mask=mask), np.where(mask, ref_scores, 0.0),
                                       rtol=0, atol=TOL)
            top = ours.top_k(q, 100, candidate_ids=ids, drop_zero=False)
            expected = _reference_order(ref_scores, ids, 100)
            # Reference library: rank-bm25 0.2.2 scores restricted to the scope, ranked (ties by lower position).
            assert [p for p, _ in top] == expected.tolist()
            np.testing.assert_allclose([s for _, s in top], ref_scores[expected], rtol=0, atol=TOL)
            positive = ours.top_k(q, 100, candidate_ids=ids)
            # Reference library: the same, leaving out passages whose rank-bm25 score is exactly 0.
            assert [p for p, _ in positive] == [p for p in expected.tolist() if ref_scores[p] != 0.0]


def test_npz_round_trip_at_20k(tmp_path, corpus_20k, built_20k):
    ours, ref = built_20k
    n = len(corpus_20k)
    extra = {"passage_ids": np.arange(n, dtype=np.int64) * 3 + 7, "doc_of_pos": (np.arange(n) // 40).astype(np.int32)}
    path = tmp_path / "bm25.npz"
    ours.to_npz(path, extra)
    loaded, got = Bm25Index.load_npz(path)
    # Round trip (no outside reference): every stored array and parameter comes back exactly.
    assert loaded.terms == ours.terms
    for name in ("idf", "indptr", "post_docs", "post_tf", "doc_len"):
        np.testing.assert_array_equal(getattr(loaded, name), getattr(ours, name))
    assert (loaded.k1, loaded.b, loaded.epsilon, loaded.average_idf) == (ours.k1, ours.b, ours.epsilon,
                                                                         ours.average_idf)
    assert set(got) == set(extra)
    for name, arr in extra.items():
        assert got[name].dtype == arr.dtype
        np.testing.assert_array_equal(got[name], arr)
    everyone = np.arange(n)
    for q in _queries(6, 23, corpus_20k):
        ref_scores = ref.get_scores(q)
        # Reference library: rank_bm25.BM25Okapi.get_scores (rank-bm25 0.2.2), via the reloaded index.
        np.testing.assert_allclose(loaded.scores(q), ref_scores, rtol=0, atol=TOL)
        np.testing.assert_array_equal(loaded.scores(q), ours.scores(q))  # identical to before saving
        # Reference library: ranking by rank-bm25 0.2.2 scores (ties by lower position).
        assert [p for p, _ in loaded.top_k(q, 100, drop_zero=False)] == _reference_order(ref_scores, everyone,
                                                                                         100).tolist()
