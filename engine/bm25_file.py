"""The BM25 statistics file of an index: ``FOLDER/.excerptor/bm25-<generation>.npz``, built from the store.

Each passage's BM25 "document" is its stored search tokens followed by its document's path tokens
(``path_search_tokens``) and title tokens (``document_title`` of its first passage); meta ``bm25_fields`` names
that rule, and a file built under another rule counts as missing. The file is written whole under a new generation
name, then meta points at it in one transaction, then older files are deleted, so a crash leaves the previous file
and meta valid.
"""

from __future__ import annotations

import hashlib
from pathlib import Path

import numpy as np

from engine.bm25 import Bm25Index, decode_strings, encode_strings
from engine.index_store import IndexStore
from engine.text_tokens import document_title, path_search_tokens, tokenize_for_search


def sha256_file(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as f:
        for chunk in iter(lambda: f.read(1 << 20), b""):
            h.update(chunk)
    return h.hexdigest()


# What each passage's BM25 "document" is made of; stored in meta so that an index built otherwise is rebuilt.
BM25_FIELDS = "passage text + document path + document title"


def bm25_file_ok(store: IndexStore, idir: Path) -> bool:
    name, sha = store.get_meta("bm25_file"), store.get_meta("bm25_sha256")
    if store.get_meta("bm25_fields") != BM25_FIELDS:
        return False
    if not name or not sha or not (idir / name).is_file():
        return False
    return sha256_file(idir / name) == sha


def document_search_tokens(doc_path: str, first_passage_text: str) -> list[str]:
    """What BM25 adds to every passage of a document: its path tokens, then its title's tokens."""
    return path_search_tokens(doc_path) + tokenize_for_search(document_title(first_passage_text))


def bm25_documents(store: IndexStore) -> tuple[list[int], list[str], list[list[str]]]:
    """Passage ids, their document paths, and what BM25 counts for each passage: its stored search tokens
    followed by ``document_search_tokens`` of its document (the ``BM25_FIELDS`` rule), in passage_id order."""
    ids, docs, token_lists = [], [], []
    firsts = store.first_passage_texts()
    doc_tokens: dict[str, list[str]] = {}
    for pid, doc_path, tokens in store.iter_passage_tokens():
        ids.append(pid)
        docs.append(doc_path)
        if doc_path not in doc_tokens:
            doc_tokens[doc_path] = document_search_tokens(doc_path, firsts.get(doc_path, ""))
        token_lists.append(tokens + doc_tokens[doc_path])
    return ids, docs, token_lists


def rebuild_bm25(store: IndexStore, idir: Path) -> Path:
    """Build BM25 from the stored tokens under the next generation name; point meta at it; drop old files."""
    ids, docs, token_lists = bm25_documents(store)
    doc_names = sorted(set(docs))
    doc_no = {d: i for i, d in enumerate(doc_names)}
    blob, offsets = encode_strings(doc_names)
    extra = {
        "passage_ids": np.asarray(ids, dtype=np.int64),
        "doc_of_pos": np.asarray([doc_no[d] for d in docs], dtype=np.int32),
        "doc_blob": blob,
        "doc_offsets": offsets,
    }
    generation = store.generation + 1
    name = f"bm25-{generation:06d}.npz"
    target = idir / name
    Bm25Index.build(token_lists).to_npz(target, extra)
    store.set_meta(
        {"generation": str(generation), "bm25_file": name, "bm25_sha256": sha256_file(target), "dirty": "0",
         "bm25_fields": BM25_FIELDS}
    )
    for old in idir.glob("bm25-*"):
        if old.name != name:
            old.unlink(missing_ok=True)
    return target


def load_bm25(path: Path) -> tuple[Bm25Index, np.ndarray, list[str], np.ndarray]:
    bm25, extra = Bm25Index.load_npz(path)
    doc_names = decode_strings(extra["doc_blob"], extra["doc_offsets"])
    return bm25, extra["passage_ids"], doc_names, extra["doc_of_pos"]
