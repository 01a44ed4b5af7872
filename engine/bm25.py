"""BM25 Okapi over a sparse term -> postings structure, numerically matching rank-bm25 0.2.2 ``BM25Okapi``.

For N passages, passage length dl (tokens), avgdl = mean dl, n(t) = number of passages containing t:

    idf(t)   = log(N - n(t) + 0.5) - log(n(t) + 0.5)          (Robertson/Zaragoza IDF, written as rank-bm25 does)
    avg_idf  = mean of idf(t) over every corpus term, taken BEFORE flooring
    idf(t)   = epsilon * avg_idf                               where idf(t) < 0 (term in more than half the passages)
    score(q, d) = sum over query tokens t (duplicates count; unknown terms add 0) of
                  idf(t) * tf(t, d) * (k1 + 1) / (tf(t, d) + k1 * (1 - b + b * dl / avgdl))

Storage (CSR): ``indptr[t]:indptr[t+1]`` slices ``post_docs`` (ascending passage positions) and ``post_tf``.
A query touches only its own terms' postings.
"""

from __future__ import annotations

import math
import os
import tempfile
from collections import Counter
from collections.abc import Mapping, Sequence
from pathlib import Path

import numpy as np

from engine import defaults

_FORMAT_VERSION = 1
_EXTRA_PREFIX = "x_"


def encode_strings(strings: Sequence[str]) -> tuple[np.ndarray, np.ndarray]:
    """UTF-8 blob (uint8) + byte offsets (int64, len+1): an npz-safe string list without pickle."""
    encoded = [s.encode("utf-8") for s in strings]
    offsets = np.zeros(len(encoded) + 1, dtype=np.int64)
    if encoded:
        offsets[1:] = np.cumsum([len(e) for e in encoded])
    return np.frombuffer(b"".join(encoded), dtype=np.uint8).copy(), offsets


def decode_strings(blob: np.ndarray, offsets: np.ndarray) -> list[str]:
    """Inverse of :func:`encode_strings`."""
    raw = blob.tobytes()
    return [raw[offsets[i] : offsets[i + 1]].decode("utf-8") for i in range(len(offsets) - 1)]


class Bm25Index:
    """Immutable BM25 Okapi statistics for passages at positions ``0..n_passages-1``."""

    def __init__(
        self,
        terms: list[str],
        idf: np.ndarray,
        indptr: np.ndarray,
        post_docs: np.ndarray,
        post_tf: np.ndarray,
        doc_len: np.ndarray,
        k1: float,
        b: float,
        epsilon: float,
        average_idf: float,
    ) -> None:
        if not (len(idf) == len(terms) == len(indptr) - 1):
            raise ValueError(f"terms/idf/indptr sizes disagree (got {len(terms)}, {len(idf)}, {len(indptr)})")
        if len(post_docs) != len(post_tf) or (len(indptr) and indptr[-1] != len(post_docs)):
            raise ValueError(f"postings sizes disagree (got {len(post_docs)}, {len(post_tf)})")
        self.terms = terms
        self.term_ids = {t: i for i, t in enumerate(terms)}
        self.idf = idf
        self.indptr = indptr
        self.post_docs = post_docs
        self.post_tf = post_tf
        self.doc_len = doc_len
        self.k1, self.b, self.epsilon = float(k1), float(b), float(epsilon)
        self.average_idf = float(average_idf)
        n = len(doc_len)
        self.avgdl = float(doc_len.sum()) / n if n else 0.0
        # Same expression order as rank-bm25, so the floats agree.
        if self.avgdl > 0:
            self._norm = self.k1 * (1 - self.b + self.b * doc_len.astype(np.float64) / self.avgdl)
        else:
            self._norm = np.full(n, self.k1 * (1 - self.b))

    @property
    def n_passages(self) -> int:
        return len(self.doc_len)

    @classmethod
    def build(
        cls,
        token_lists: Sequence[list[str]],
        k1: float = defaults.BM25_K1,
        b: float = defaults.BM25_B,
        epsilon: float = defaults.BM25_EPSILON,
    ) -> Bm25Index:
        """Count terms; idf as in the module docstring. An empty corpus gives an index that scores nothing."""
        if k1 < 0 or not 0 <= b <= 1:
            raise ValueError(f"need k1 >= 0 and 0 <= b <= 1 (got k1={k1}, b={b})")
        term_ids: dict[str, int] = {}  # first-appearance order, as rank-bm25's nd dict
        df: list[int] = []
        rows: list[int] = []
        tfs: list[int] = []
        docs: list[int] = []
        doc_len = np.zeros(len(token_lists), dtype=np.int64)
        for d, tokens in enumerate(token_lists):
            doc_len[d] = len(tokens)
            for term, tf in Counter(tokens).items():
                tid = term_ids.get(term)
                if tid is None:
                    tid = term_ids[term] = len(df)
                    df.append(0)
                df[tid] += 1
                rows.append(tid)
                tfs.append(tf)
                docs.append(d)
        n_docs = len(token_lists)
        idf_list = [math.log(n_docs - f + 0.5) - math.log(f + 0.5) for f in df]
        idf_sum = 0.0
        for v in idf_list:  # sequential sum in dict order, as rank-bm25
            idf_sum += v
        average_idf = idf_sum / len(idf_list) if idf_list else 0.0
        eps = epsilon * average_idf
        idf = np.array([eps if v < 0 else v for v in idf_list], dtype=np.float64)

        row_arr = np.asarray(rows, dtype=np.int64)
        order = np.argsort(row_arr, kind="stable")  # postings grouped by term, positions ascending
        indptr = np.zeros(len(df) + 1, dtype=np.int64)
        indptr[1:] = np.cumsum(np.bincount(row_arr, minlength=len(df)))
        post_docs = np.asarray(docs, dtype=np.int32)[order]
        post_tf = np.asarray(tfs, dtype=np.int32)[order]
        return cls(list(term_ids), idf, indptr, post_docs, post_tf, doc_len, k1, b, epsilon, average_idf)

    def _check_mask(self, candidate_mask: np.ndarray | None) -> np.ndarray | None:
        if candidate_mask is None:
            return None
        mask = np.asarray(candidate_mask)
        if mask.dtype != bool or mask.shape != (self.n_passages,):
            raise ValueError(
                f"candidate_mask must be a bool array of shape ({self.n_passages},) (got {mask.dtype} {mask.shape})"
            )
        return mask

    def scores(self, query_tokens: Sequence[str], candidate_mask: np.ndarray | None = None) -> np.ndarray:
        """Dense float64 scores of every passage; outside ``candidate_mask`` (if given) they are 0."""
        mask = self._check_mask(candidate_mask)
        out = np.zeros(self.n_passages, dtype=np.float64)
        k1p1 = self.k1 + 1
        for q in query_tokens:
            tid = self.term_ids.get(q)
            if tid is None:
                continue
            lo, hi = self.indptr[tid], self.indptr[tid + 1]
            docs = self.post_docs[lo:hi]
            tf = self.post_tf[lo:hi].astype(np.float64)
            out[docs] += self.idf[tid] * (tf * k1p1 / (tf + self._norm[docs]))
        if mask is not None:
            out[~mask] = 0.0
        return out

    def top_k(
        self,
        query_tokens: Sequence[str],
        k: int,
        candidate_ids: np.ndarray | None = None,
        drop_zero: bool = True,
    ) -> list[tuple[int, float]]:
        """Best ``k`` (position, score) pairs, score descending, ties by lower position.

        ``candidate_ids`` restricts the search to those positions. ``drop_zero`` leaves out passages whose
        score is exactly 0 (they share no weighted term with the query).
        """
        if k < 0:
            raise ValueError(f"k must be >= 0 (got {k})")
        if candidate_ids is None:
            ids = np.arange(self.n_passages, dtype=np.int64)
        else:
            ids = np.unique(np.asarray(candidate_ids, dtype=np.int64))
            if len(ids) and (ids[0] < 0 or ids[-1] >= self.n_passages):
                raise ValueError(f"candidate_ids must lie in [0, {self.n_passages}) (got {ids[0]}..{ids[-1]})")
        if k == 0 or len(ids) == 0:
            return []
        s = self.scores(query_tokens)[ids]
        if drop_zero:
            keep = s != 0.0
            ids, s = ids[keep], s[keep]
        if len(ids) > k:
            part = np.argpartition(-s, k - 1)[:k]
            threshold = s[part].min()
            sel = np.flatnonzero(s >= threshold)  # all ties at the boundary, so the tie-break is exact
            ids, s = ids[sel], s[sel]
        order = np.lexsort((ids, -s))[:k]
        return [(int(ids[i]), float(s[i])) for i in order]

    def to_npz(self, path: Path, extra: Mapping[str, np.ndarray] | None = None) -> None:
        """Write (atomically: temp file in the same folder, then os.replace). ``extra`` arrays ride along."""
        path = Path(path)
        blob, offsets = encode_strings(self.terms)
        arrays = {
            "format_version": np.array([_FORMAT_VERSION], dtype=np.int64),
            "params": np.array([self.k1, self.b, self.epsilon, self.average_idf], dtype=np.float64),
            "term_blob": blob,
            "term_offsets": offsets,
            "idf": self.idf,
            "indptr": self.indptr,
            "post_docs": self.post_docs,
            "post_tf": self.post_tf,
            "doc_len": self.doc_len,
        }
        for name, arr in (extra or {}).items():
            arrays[_EXTRA_PREFIX + name] = np.asarray(arr)
        fd, tmp = tempfile.mkstemp(prefix=path.name + ".", suffix=".tmp", dir=path.parent)
        try:
            with os.fdopen(fd, "wb") as f:
                np.savez(f, allow_pickle=False, **arrays)
                f.flush()
                os.fsync(f.fileno())
            os.replace(tmp, path)
        except BaseException:
            Path(tmp).unlink(missing_ok=True)
            raise

    @classmethod
    def load_npz(cls, path: Path) -> tuple[Bm25Index, dict[str, np.ndarray]]:
        """Read an index written by :meth:`to_npz`, with its ``extra`` arrays. Bad files raise ValueError."""
        try:
            with np.load(Path(path), allow_pickle=False) as z:
                arrays = {name: z[name] for name in z.files}
        except (OSError, EOFError, ValueError) as exc:
            raise ValueError(f"cannot read BM25 file {path} (got {exc})") from exc
        required = ("format_version", "params", "term_blob", "term_offsets", "idf", "indptr", "post_docs")
        missing = [n for n in (*required, "post_tf", "doc_len") if n not in arrays]
        if missing or int(arrays["format_version"][0]) != _FORMAT_VERSION:
            raise ValueError(f"not a BM25 file of format {_FORMAT_VERSION}: {path} (missing {missing})")
        k1, b, epsilon, average_idf = (float(v) for v in arrays["params"])
        index = cls(
            decode_strings(arrays["term_blob"], arrays["term_offsets"]),
            arrays["idf"],
            arrays["indptr"],
            arrays["post_docs"],
            arrays["post_tf"],
            arrays["doc_len"],
            k1,
            b,
            epsilon,
            average_idf,
        )
        extra = {n[len(_EXTRA_PREFIX) :]: a for n, a in arrays.items() if n.startswith(_EXTRA_PREFIX)}
        return index, extra

    @classmethod
    def from_npz(cls, path: Path) -> Bm25Index:
        """Read an index written by :meth:`to_npz` (ignoring extras)."""
        return cls.load_npz(path)[0]
