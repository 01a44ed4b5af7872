"""Property-based fuzzing (hypothesis) of ingest and text handling: nothing raises, the documented invariants hold.

Invariants come from the module docstrings: engine/ingest/parse.py (never raises; a Document or one fatal
problem), engine/ingest/text_repair.py (the map back to the raw text), engine/sentences.py (sorted,
non-overlapping, trimmed spans), engine/passages.py (``passage.text == page.text[start:end]``, at most
``max_words`` words), engine/text_tokens.py (lower-case tokens of at most MAX_TOKEN_CHARS characters).
Seed files are written by reference writers (fpdf2, python-docx) and then damaged by hypothesis.
"""

from __future__ import annotations

import io
import re

import pytest
from fpdf import FPDF
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from engine.ingest.parse import parse_file
from engine.ingest.text_repair import LIGATURES, map_span_to_raw, repair_text
from engine.passages import split_passages
from engine.sentences import split_sentences
from engine.text_tokens import MAX_TOKEN_CHARS, tokenize_for_search
from engine.types import Document, Page

FUZZ = settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture,
                                                                          HealthCheck.too_slow])


def _seed_pdf() -> bytes:
    pdf = FPDF()
    pdf.set_font("Helvetica", size=11)  # core font: latin-1 only (fpdf2 documentation)
    pdf.add_page()
    pdf.multi_cell(0, 7, "The Lessee shall insure the premises. Rent is $1,200 per month.")
    return bytes(pdf.output())


def _seed_docx() -> bytes:
    import docx

    d = docx.Document()
    d.add_paragraph("The Distributor may not sell outside the Territory.")
    d.add_table(rows=1, cols=2).rows[0].cells[0].text = "Fee"
    out = io.BytesIO()
    d.save(out)
    return out.getvalue()


SEEDS = {".pdf": _seed_pdf(), ".docx": _seed_docx(), ".txt": "Notice is due in 30 days.\f Page two.".encode(),
         ".md": "# Terms\n\nPayment net 30.".encode()}


@st.composite
def damaged(draw, suffix: str) -> bytes:
    """The seed file of ``suffix`` with random truncation, byte flips and an inserted run of random bytes."""
    data = bytearray(SEEDS[suffix])
    if draw(st.booleans()):
        data = data[: draw(st.integers(0, len(data)))]
    for _ in range(draw(st.integers(0, 6))):
        if data:
            data[draw(st.integers(0, len(data) - 1))] = draw(st.integers(0, 255))
    at = draw(st.integers(0, len(data)))
    data[at:at] = draw(st.binary(max_size=64))
    return bytes(data)


PREFIXES = [b"", b"%PDF-1.7\n", b"PK\x03\x04", b"\xef\xbb\xbf", b"\xff\xfe", b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"]


@st.composite
def file_case(draw) -> tuple[str, bytes]:
    suffix = draw(st.sampled_from(sorted(SEEDS)))
    kind = draw(st.sampled_from(["random", "prefixed", "damaged"]))
    if kind == "random":
        return suffix, draw(st.binary(max_size=2048))
    if kind == "prefixed":
        return suffix, draw(st.sampled_from(PREFIXES)) + draw(st.binary(max_size=1024))
    return suffix, draw(damaged(suffix))


@FUZZ
@given(case=file_case())
def test_parse_file_never_raises(tmp_path, case):
    suffix, data = case
    path = tmp_path / f"fuzzed{suffix}"
    path.write_bytes(data)
    doc, problems = parse_file(path, path.name)
    if doc is None:  # one fatal, plain problem line (engine/ingest/parse.py)
        assert len(problems) == 1 and problems[0].fatal and problems[0].path == path.name
        reason = problems[0].reason
        assert reason and "\n" not in reason and "Traceback" not in reason
    else:
        assert [p.reason for p in problems] == list(doc.warnings) and not any(p.fatal for p in problems)
        assert doc.size == len(data) and doc.kind == suffix[1:]
        assert all(isinstance(p.text, str) for p in doc.pages)
        for passage in split_passages(doc):
            page = next(p for p in doc.pages if (p.number, p.locator) == (passage.page_number, passage.locator))
            assert page.text[passage.start : passage.end] == passage.text


# Characters the repair step treats specially (engine/ingest/text_repair.py), mixed with ordinary text.
SPECIAL = "".join(LIGATURES) + "\r\n\f\x0b\u2028\u2029\t\u00a0\u2003\u200b\ufeff\u00ad\x00\x07\x85-  "
TEXTS = st.text(alphabet=st.sampled_from(SPECIAL) | st.characters(codec="utf-8"), max_size=300)
_NEWLINE_SOURCES = "\r\n\x0b\x0c\u2028\u2029"
_SPACE_SOURCES = " \t\u00a0\u1680\u2000\u2001\u2002\u2003\u2004\u2005\u2006\u2007\u2008\u2009\u200a\u202f\u205f\u3000"


@FUZZ
@given(raw=TEXTS, join=st.booleans(), collapse=st.booleans(), data=st.data())
def test_repair_text_map(raw, join, collapse, data):
    r = repair_text(raw, join_hyphens=join, collapse_spaces=collapse)
    # to_raw: one slot per character plus an end slot, never decreasing, ends at len(raw) (module docstring).
    assert len(r.to_raw) == len(r.text) + 1 and r.to_raw[-1] == len(raw)
    assert all(a <= b for a, b in zip(r.to_raw, r.to_raw[1:]))
    for ch, i in zip(r.text, r.to_raw):
        src = raw[i]
        assert (src == ch or ch in LIGATURES.get(src, "") or (ch == "\n" and src in _NEWLINE_SOURCES)
                or (ch == " " and src in _SPACE_SOURCES)), (ch, src)
    start = data.draw(st.integers(0, len(r.text)))
    end = data.draw(st.integers(start, len(r.text)))
    a, b = map_span_to_raw(r, start, end)
    assert 0 <= a <= b <= len(raw)
    if end > start:
        assert raw[a] == r.text[start] or r.text[start] in LIGATURES.get(raw[a], "") or r.text[start] in " \n"


SENTENCE_TEXTS = st.lists(
    st.one_of(
        st.sampled_from(["The Tenant pays rent.", "Sec. 4.2 applies.", "9.", "(a)", "Inc.", "e.g.", "\n\n", "\n",
                         "U.S. law governs.", "$1,000.00", "iv.", "Notice!", "...", "  ", "“Quoted.”"]),
        st.text(max_size=40),
    ),
    max_size=25,
).map(" ".join)


@FUZZ
@given(text=SENTENCE_TEXTS)
def test_split_sentences_spans(text):
    spans = split_sentences(text)
    prev_end = 0
    for start, end in spans:  # sorted, non-overlapping, non-empty, trimmed (engine/sentences.py)
        assert prev_end <= start < end <= len(text)
        assert not text[start].isspace() and not text[end - 1].isspace()
        prev_end = end
    assert bool(spans) == bool(text.strip())


@FUZZ
@given(pages=st.lists(SENTENCE_TEXTS, min_size=1, max_size=3),
       sizes=st.tuples(st.integers(1, 12), st.integers(0, 12), st.integers(0, 12)), overlap=st.integers(0, 2))
def test_split_passages_slices(pages, sizes, overlap):
    min_w = sizes[0]
    target = min_w + sizes[1]
    max_w = target + sizes[2]
    doc = Document("fuzz.txt", "txt", tuple(Page(n, t, f"p. {n}") for n, t in enumerate(pages, 1)), 0, 0, "0" * 64)
    passages = split_passages(doc, 7, target_words=target, max_words=max_w, min_words=min_w,
                              overlap_sentences=overlap)
    assert [p.passage_id for p in passages] == list(range(7, 7 + len(passages)))
    covered = {n: set() for n in range(1, len(pages) + 1)}
    for p in passages:
        page = doc.pages[p.page_number - 1]
        assert p.locator == page.locator and page.text[p.start : p.end] == p.text  # engine/passages.py
        assert len(p.text.split()) <= max_w
        covered[p.page_number].update(range(p.start, p.end))
    for page in doc.pages:  # nothing that is not white space is left out of every passage
        missing = [m.start() for m in re.finditer(r"\S", page.text) if m.start() not in covered[page.number]]
        assert not missing, (page.text, missing[:5])


@FUZZ
@given(text=TEXTS | SENTENCE_TEXTS)
def test_tokenize_for_search_tokens(text):
    tokens = tokenize_for_search(text)
    assert tokens == tokenize_for_search(text)  # a pure function (engine/text_tokens.py)
    for t in tokens:
        assert t and t == t.lower() and len(t) <= MAX_TOKEN_CHARS and not any(c.isspace() for c in t)


def test_tokenize_rejects_non_text():
    with pytest.raises(ValueError):
        tokenize_for_search(b"bytes")  # type: ignore[arg-type]
