"""BM25 Okapi: checked against rank-bm25 0.2.2 (reference library) and a hand-worked example."""

from __future__ import annotations

import math
import random

import numpy as np
import pytest
from rank_bm25 import BM25Okapi

from engine.bm25 import Bm25Index

_STEMS = [
    "indemn", "licens", "vendor", "escrow", "warrant", "remedi", "arbitr", "assign", "covenant", "lien",
    "royalti", "sublicens", "tranch", "novat", "forbear", "surety", "tortious", "estoppel", "waiver", "custodi",
]


def _vocab(size: int, seed: int) -> list[str]:
    """Invented contract-like words: stem + suffix + number, e.g. 'escrowal17'."""
    rng = random.Random(seed)
    suffixes = ["", "al", "or", "ee", "ance", "ment", "ive", "ity"]
    return [f"{rng.choice(_STEMS)}{rng.choice(suffixes)}{i}" for i in range(size)]


def _corpus(n_docs: int, vocab_size: int, seed: int) -> list[list[str]]:
    """Zipf-like term draws (a few terms in most passages, a long tail), 20-150 tokens per passage."""
    rng = np.random.default_rng(seed)
    vocab = np.array(_vocab(vocab_size, seed))
    p = 1.0 / np.arange(1, vocab_size + 1) ** 1.1
    p /= p.sum()
    lengths = rng.integers(20, 151, size=n_docs)
    draws = rng.choice(vocab_size, size=int(lengths.sum()), p=p)
    out, pos = [], 0
    for n in lengths:
        out.append(vocab[draws[pos : pos + n]].tolist())
        pos += n
    return out


def _queries(corpus: list[list[str]], vocab: list[str]) -> list[list[str]]:
    df: dict[str, int] = {}
    for doc in corpus:
        for t in set(doc):
            df[t] = df.get(t, 0) + 1
    common = [t for t, n in df.items() if n > len(corpus) / 2]  # negative raw idf -> epsilon floor
    rare = sorted(df, key=lambda t: (df[t], t))[:2]  # the two rarest terms
    assert common
    return [
        [common[0]],
        [rare[0], rare[1], common[0]],
        [rare[0], rare[0], vocab[5], "no-such-term"],  # repeated and unknown terms
        ["no-such-term"],
        [vocab[3], vocab[10], vocab[40], vocab[3], common[-1]],
        [],
    ]


def test_scores_equal_rank_bm25_on_200_passages():
    # Reference library: rank_bm25.BM25Okapi(corpus).get_scores(query), rank-bm25 0.2.2.
    corpus = _corpus(200, 400, seed=1)
    ours, ref = Bm25Index.build(corpus), BM25Okapi(corpus)
    assert ours.average_idf == pytest.approx(ref.average_idf, abs=1e-12)
    for q in _queries(corpus, _vocab(400, 1)):
        np.testing.assert_allclose(ours.scores(q), ref.get_scores(q), rtol=0, atol=1e-9)


def test_non_default_parameters_equal_rank_bm25():
    # Reference library: rank_bm25.BM25Okapi with k1, b, epsilon given, rank-bm25 0.2.2.
    corpus = _corpus(120, 150, seed=2) + [[]]  # an empty passage too
    ours = Bm25Index.build(corpus, k1=0.9, b=0.4, epsilon=0.5)
    ref = BM25Okapi(corpus, k1=0.9, b=0.4, epsilon=0.5)
    for q in _queries(corpus, _vocab(150, 2)):
        np.testing.assert_allclose(ours.scores(q), ref.get_scores(q), rtol=0, atol=1e-9)


def test_worked_example_by_hand():
    # Robertson & Zaragoza (2009), "The Probabilistic Relevance Framework: BM25 and Beyond":
    #   w(t, d) = idf(t) * tf (k1 + 1) / (tf + k1 ((1 - b) + b dl / avdl)),  idf(t) = log((N - n + 0.5) / (n + 0.5)).
    # rank-bm25 0.2.2 (reference library) adds: a negative idf becomes epsilon * (mean idf over all terms).
    corpus = [["a", "b", "a"], ["b", "c"], ["b", "d", "d", "e"], ["c", "e"]]
    k1, b, eps = 1.5, 0.75, 0.25
    n_docs, avdl = 4, 11 / 4  # lengths 3 + 2 + 4 + 2
    # document frequencies: a 1, b 3, c 2, d 1, e 2
    idf_rare = math.log((4 - 1 + 0.5) / (1 + 0.5))  # a, d: log(7/3)
    idf_b_raw = math.log((4 - 3 + 0.5) / (3 + 0.5))  # log(3/7) < 0 -> floored
    idf_half = math.log((4 - 2 + 0.5) / (2 + 0.5))  # c, e: log(1) = 0
    mean_idf = (2 * idf_rare + idf_b_raw + 2 * idf_half) / 5  # = log(7/3) / 5
    idf_b = eps * mean_idf
    assert idf_b_raw < 0 and idf_half == 0.0

    def w(idf: float, tf: int, dl: int) -> float:
        return idf * tf * (k1 + 1) / (tf + k1 * ((1 - b) + b * dl / avdl))

    index = Bm25Index.build(corpus, k1=k1, b=b, epsilon=eps)
    expected_ab = [w(idf_rare, 2, 3) + w(idf_b, 1, 3), w(idf_b, 1, 2), w(idf_b, 1, 4), 0.0]
    np.testing.assert_allclose(index.scores(["a", "b"]), expected_ab, rtol=0, atol=1e-12)
    expected_dd = [0.0, 0.0, 2 * w(idf_rare, 2, 4), 0.0]  # a repeated query term counts twice
    np.testing.assert_allclose(index.scores(["d", "d"]), expected_dd, rtol=0, atol=1e-12)
    np.testing.assert_allclose(index.scores(["c", "e", "zzz"]), [0.0] * 4, rtol=0, atol=0)
    # and the reference library agrees on the same toy corpus
    np.testing.assert_allclose(BM25Okapi(corpus).get_scores(["a", "b"]), expected_ab, rtol=0, atol=1e-12)


def _reference_top(ref_scores: np.ndarray, k: int) -> list[int]:
    """rank-bm25 scores, ordered by score descending, ties by lower position (our documented tie rule)."""
    return np.lexsort((np.arange(len(ref_scores)), -ref_scores))[:k].tolist()


@pytest.mark.parametrize("n_docs,vocab_size", [(1_000, 2_000), (20_000, 20_000)])
def test_top_100_equals_rank_bm25(n_docs, vocab_size):
    # Reference library: rank_bm25.BM25Okapi(corpus).get_scores(query), rank-bm25 0.2.2.
    corpus = _corpus(n_docs, vocab_size, seed=n_docs)
    ours, ref = Bm25Index.build(corpus), BM25Okapi(corpus)
    vocab = _vocab(vocab_size, n_docs)
    for q in _queries(corpus, vocab)[:3] + [[vocab[7], vocab[99], vocab[500]]]:
        ref_scores = ref.get_scores(q)
        top = ours.top_k(q, 100, drop_zero=False)
        assert [pos for pos, _ in top] == _reference_top(ref_scores, 100)
        np.testing.assert_allclose([s for _, s in top], np.sort(ref_scores)[::-1][:100], rtol=0, atol=1e-6)


def test_top_k_ties_and_zero_scores():
    # Own rule (no source): equal scores rank the lower passage position first; zero scores are left out.
    corpus = [["x", "y"], ["a"], ["x", "y"], ["x", "y"], ["b"]]
    index = Bm25Index.build(corpus)
    top = index.top_k(["x"], 2)
    assert [pos for pos, _ in top] == [0, 2]
    assert [pos for pos, _ in index.top_k(["x"], 10)] == [0, 2, 3]
    assert len(index.top_k(["x"], 10, drop_zero=False)) == 5
    assert index.top_k(["x"], 0) == []
    with pytest.raises(ValueError):
        index.top_k(["x"], -1)
    with pytest.raises(ValueError):
        index.top_k(["x"], 3, candidate_ids=np.array([7]))


def test_scoped_query_equals_masked_full_scores():
    # Invariant (no source): a scope only zeroes the scores outside it.
    corpus = _corpus(300, 300, seed=3)
    index = Bm25Index.build(corpus)
    q = _queries(corpus, _vocab(300, 3))[1]
    full = index.scores(q)
    mask = np.zeros(300, dtype=bool)
    mask[50:120] = True
    np.testing.assert_array_equal(index.scores(q, candidate_mask=mask), np.where(mask, full, 0.0))
    scoped = index.top_k(q, 10, candidate_ids=np.flatnonzero(mask))
    expected = [p for p in np.lexsort((np.arange(300), -full)).tolist() if mask[p] and full[p] != 0][:10]
    assert [pos for pos, _ in scoped] == expected
    with pytest.raises(ValueError):
        index.scores(q, candidate_mask=np.ones(5, dtype=bool))


def test_npz_round_trip(tmp_path):
    # Invariant (no source): a reloaded index scores exactly as the one written.
    corpus = _corpus(150, 200, seed=4) + [["ünïcode", "€5000", "14.2(b)"]]
    index = Bm25Index.build(corpus, k1=1.2, b=0.6)
    path = tmp_path / "bm25.npz"
    extra = {"passage_ids": np.arange(151, dtype=np.int64) * 3}
    index.to_npz(path, extra)
    assert [p.name for p in tmp_path.iterdir()] == ["bm25.npz"]  # no temp file left behind
    loaded, loaded_extra = Bm25Index.load_npz(path)
    assert loaded.terms == index.terms
    assert (loaded.k1, loaded.b, loaded.epsilon) == (1.2, 0.6, 0.25)
    np.testing.assert_array_equal(loaded_extra["passage_ids"], extra["passage_ids"])
    for q in _queries(corpus[:150], _vocab(200, 4)) + [["€5000", "14.2(b)"]]:
        np.testing.assert_array_equal(Bm25Index.from_npz(path).scores(q), index.scores(q))
    with np.load(path, allow_pickle=False) as z:  # loads without pickle
        assert "idf" in z.files
    (tmp_path / "bad.npz").write_bytes(b"not a zip")
    with pytest.raises(ValueError):
        Bm25Index.from_npz(tmp_path / "bad.npz")


def test_empty_corpus():
    index = Bm25Index.build([])
    assert index.n_passages == 0
    assert index.scores(["a"]).shape == (0,)
    assert index.top_k(["a"], 5) == []
