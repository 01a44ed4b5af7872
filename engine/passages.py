"""Cut a document's pages into sentence-aware, overlapping passages.

Rules (word = a run of non-space characters):
- a passage is whole consecutive sentences of ONE page; it never crosses a page (nor a document);
- sentences are added until the passage reaches ``PASSAGE_TARGET_WORDS``, never going past
  ``PASSAGE_MAX_WORDS``; if what is left of the page is under ``PASSAGE_MIN_WORDS``, it is taken in when it
  fits, otherwise sentences are handed over to it while both parts stay at or above the minimum;
- the next passage starts ``PASSAGE_OVERLAP_SENTENCES`` sentence(s) back, when those still fit with the next
  new sentence (so every passage brings at least one new sentence);
- a sentence longer than ``PASSAGE_MAX_WORDS`` is cut at word boundaries into pieces of at most that many;
- a short page gives one short passage; an empty page (or one with no text layer) gives none.

Invariant: ``passage.text == page.text[passage.start:passage.end]``; passage ids run consecutively from
``start_id`` in page order.
"""

from __future__ import annotations

import re

from engine import defaults
from engine.sentences import split_sentences
from engine.types import Document, Page, Passage

_WORD_RE = re.compile(r"\S+")


def _units(text: str, max_words: int) -> list[tuple[int, int, int]]:
    """Sentence spans as ``(start, end, words)``, with over-long sentences cut at word boundaries."""
    units: list[tuple[int, int, int]] = []
    for start, end in split_sentences(text):
        words = [m.span() for m in _WORD_RE.finditer(text, start, end)]
        if not words:
            continue
        for k in range(0, len(words), max_words):
            chunk = words[k : k + max_words]
            units.append((chunk[0][0], chunk[-1][1], len(chunk)))
    return units


def _page_groups(
    units: list[tuple[int, int, int]], target: int, max_words: int, min_words: int, overlap: int
) -> list[tuple[int, int]]:
    """Group unit indices into passages: a list of half-open ``(first, last + 1)`` ranges."""
    groups: list[tuple[int, int]] = []
    n = len(units)
    words_from = [0] * (n + 1)  # words_from[k] = words in units[k:]
    for k in range(n - 1, -1, -1):
        words_from[k] = words_from[k + 1] + units[k][2]
    first = 0
    while first < n:
        words = 0
        j = first
        while j < n:
            w = units[j][2]
            if words > 0 and words + w > max_words:
                break
            words += w
            j += 1
            if words >= target:
                break
        rest = words_from[j]
        if 0 < rest < min_words and words + rest <= max_words:
            j = n
        elif 0 < rest < min_words:
            # Tail too short and too big to absorb: hand sentences over to it while both stay >= min.
            while (
                j - 1 > first
                and words_from[max(first + 1, j - overlap)] < min_words
                and words - units[j - 1][2] >= min_words
            ):
                j -= 1
                words -= units[j][2]
        groups.append((first, j))
        if j >= n:
            break
        nxt = j
        back = 0
        while back < overlap and nxt - 1 > first:
            kept = sum(u[2] for u in units[nxt - 1 : j]) + units[j][2]
            if kept > max_words:
                break
            nxt -= 1
            back += 1
        first = nxt
    return groups


def _check_settings(target: int, max_words: int, min_words: int, overlap: int) -> None:
    if not (1 <= min_words <= target <= max_words):
        raise ValueError(
            f"passage sizes need 1 <= min <= target <= max (got {min_words}, {target}, {max_words})"
        )
    if overlap < 0:
        raise ValueError(f"passage overlap must be >= 0 sentences (got {overlap})")


def split_page(
    doc_path: str,
    page: Page,
    start_id: int = 0,
    *,
    target_words: int = defaults.PASSAGE_TARGET_WORDS,
    max_words: int = defaults.PASSAGE_MAX_WORDS,
    min_words: int = defaults.PASSAGE_MIN_WORDS,
    overlap_sentences: int = defaults.PASSAGE_OVERLAP_SENTENCES,
) -> list[Passage]:
    """Passages of one page, ids from ``start_id`` (see the module docstring)."""
    _check_settings(target_words, max_words, min_words, overlap_sentences)
    if not page.has_text_layer or not page.text.strip():
        return []
    units = _units(page.text, max_words)
    passages: list[Passage] = []
    for first, last in _page_groups(units, target_words, max_words, min_words, overlap_sentences):
        start, end = units[first][0], units[last - 1][1]
        passages.append(
            Passage(
                passage_id=start_id + len(passages),
                doc_path=doc_path,
                page_number=page.number,
                locator=page.locator,
                start=start,
                end=end,
                text=page.text[start:end],
            )
        )
    return passages


def split_passages(
    doc: Document,
    start_id: int = 0,
    *,
    target_words: int = defaults.PASSAGE_TARGET_WORDS,
    max_words: int = defaults.PASSAGE_MAX_WORDS,
    min_words: int = defaults.PASSAGE_MIN_WORDS,
    overlap_sentences: int = defaults.PASSAGE_OVERLAP_SENTENCES,
) -> list[Passage]:
    """All passages of ``doc``, page by page, ids consecutive from ``start_id``."""
    if start_id < 0:
        raise ValueError(f"start_id must be >= 0 (got {start_id})")
    passages: list[Passage] = []
    for page in doc.pages:
        passages.extend(
            split_page(
                doc.path,
                page,
                start_id + len(passages),
                target_words=target_words,
                max_words=max_words,
                min_words=min_words,
                overlap_sentences=overlap_sentences,
            )
        )
    return passages
