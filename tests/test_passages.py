"""split_passages: sentence-aware, overlapping, page-bounded passages."""

from __future__ import annotations

import pytest

from engine import defaults
from engine.passages import split_passages
from engine.sentences import split_sentences
from engine.types import Document, Page


def _doc(*pages: Page) -> Document:
    return Document(path="a/lease.txt", kind="txt", pages=pages, size=1, mtime_ns=0, sha256="0" * 64)


def _sentences(n: int, first: int = 1) -> str:
    # Each sentence has exactly 8 words as counted by str.split() (Python reference behaviour).
    return " ".join(f"Clause {k} says the Tenant pays rent monthly." for k in range(first, first + n))


def _words(text: str) -> int:
    return len(text.split())


def _check_invariants(doc: Document, passages, start_id: int = 0):
    assert [p.passage_id for p in passages] == list(range(start_id, start_id + len(passages)))
    by_locator = {pg.locator: pg for pg in doc.pages}
    for p in passages:
        page = by_locator[p.locator]
        assert p.text == page.text[p.start : p.end]  # invariant from engine/types.py (Passage)
        assert p.page_number == page.number and p.doc_path == doc.path
        assert _words(p.text) <= defaults.PASSAGE_MAX_WORDS


def test_long_page_sizes_and_overlap():
    page = Page(number=4, text=_sentences(100), locator="p. 4")  # 800 words
    doc = _doc(page)
    passages = split_passages(doc, start_id=10)
    _check_invariants(doc, passages, start_id=10)
    assert len(passages) > 1
    sizes = [_words(p.text) for p in passages]
    assert all(defaults.PASSAGE_MIN_WORDS <= s <= defaults.PASSAGE_MAX_WORDS for s in sizes)
    # Only the last two may be under the target (a short tail is balanced with the passage before it).
    assert all(s >= defaults.PASSAGE_TARGET_WORDS for s in sizes[:-2])
    # Consecutive passages share exactly PASSAGE_OVERLAP_SENTENCES (= 1) sentence.
    sents = split_sentences(page.text)
    for prev, nxt in zip(passages, passages[1:]):
        inside_prev = [s for s in sents if prev.start <= s[0] and s[1] <= prev.end]
        assert nxt.start == inside_prev[-defaults.PASSAGE_OVERLAP_SENTENCES][0]
    # Every sentence is covered; the last passage ends at the page end.
    assert passages[0].start == 0 and passages[-1].end == len(page.text)
    for a, b in sents:
        assert any(p.start <= a and b <= p.end for p in passages)


def test_passages_never_cross_pages_and_ids_run_on():
    pages = (
        Page(number=1, text=_sentences(30), locator="p. 1"),
        Page(number=2, text="", locator="p. 2", has_text_layer=False),
        Page(number=3, text="Short page. Only two sentences.", locator="p. 3"),
        Page(number=4, text="   \n ", locator="p. 4"),
    )
    doc = _doc(*pages)
    passages = split_passages(doc, start_id=3)
    _check_invariants(doc, passages, start_id=3)
    assert {p.page_number for p in passages} == {1, 3}
    short = [p for p in passages if p.page_number == 3]
    assert len(short) == 1 and short[0].text == "Short page. Only two sentences."


def test_short_tail_is_absorbed_when_it_fits():
    # 19 sentences = 152 words reach the target; 2 more (16 words) are under the minimum and fit under
    # the max, so they are taken in.
    doc = _doc(Page(number=None, text=_sentences(21), locator="whole file"))
    passages = split_passages(doc)
    _check_invariants(doc, passages)
    assert len(passages) == 1 and _words(passages[0].text) == 168


@pytest.mark.parametrize("n", [13, 20, 37, 38, 45, 60, 100])
def test_every_passage_reaches_the_minimum(n):
    # Pages of >= 13 sentences (104 words) give passages of at least PASSAGE_MIN_WORDS (engine/defaults.py).
    doc = _doc(Page(number=1, text=_sentences(n), locator="p. 1"))
    passages = split_passages(doc)
    _check_invariants(doc, passages)
    assert all(_words(p.text) >= defaults.PASSAGE_MIN_WORDS for p in passages)


def test_huge_sentence_is_cut_at_word_boundaries():
    text = " ".join(f"w{k}" for k in range(450)) + "."
    doc = _doc(Page(number=1, text=text, locator="p. 1"))
    passages = split_passages(doc)
    _check_invariants(doc, passages)
    assert [_words(p.text) for p in passages] == [200, 200, 50]
    assert passages[0].text.split()[-1] == "w199" and passages[1].text.split()[0] == "w200"
    assert " ".join(p.text for p in passages) == text


def test_bad_settings():
    doc = _doc(Page(number=1, text="A sentence.", locator="p. 1"))
    with pytest.raises(ValueError):
        split_passages(doc, start_id=-1)
    with pytest.raises(ValueError):
        split_passages(doc, min_words=50, target_words=40, max_words=60)
