"""repair_text / map_span_to_raw: hand-made strings with known raw positions."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from engine.ingest.text_repair import LIGATURES, map_span_to_raw, repair_text


def _raw_of(raw: str, repaired, word: str) -> str:
    start = repaired.text.index(word)
    a, b = map_span_to_raw(repaired, start, start + len(word))
    return raw[a:b]


def test_hyphen_and_ligature_example():
    raw = "con-\ntract \ufb01le"
    r = repair_text(raw)
    # Ligature U+FB01 LATIN SMALL LIGATURE FI decomposes to "f" "i" (Unicode standard, UnicodeData.txt).
    assert r.text == "contract file"
    assert len(r.to_raw) == len(r.text) + 1
    assert r.to_raw[-1] == len(raw)
    assert _raw_of(raw, r, "contract") == "con-\ntract"
    assert _raw_of(raw, r, "file") == "\ufb01le"
    # Both letters of the expanded ligature map to the one raw ligature character.
    i = r.text.index("fi")
    assert r.to_raw[i] == r.to_raw[i + 1] == raw.index("\ufb01")


@pytest.mark.parametrize(
    "lig, letters",
    # Alphabetic Presentation Forms U+FB00..U+FB04 and their decompositions
    # (Unicode standard, UnicodeData.txt).
    [("\ufb00", "ff"), ("\ufb01", "fi"), ("\ufb02", "fl"), ("\ufb03", "ffi"), ("\ufb04", "ffl")],
)
def test_each_ligature(lig, letters):
    r = repair_text(f"a{lig}x")
    assert r.text == f"a{letters}x"
    assert [r.to_raw[k] for k in range(1, 1 + len(letters))] == [1] * len(letters)


def test_soft_hyphen_and_line_end_hyphenation():
    # U+00AD SOFT HYPHEN is an invisible line-break hint (Unicode standard, Latin-1 Supplement chart).
    raw = "termi\u00ad\nnation and inter\u00adest; payment in-\n  advance"
    r = repair_text(raw)
    assert r.text == "termination and interest; payment inadvance"
    assert _raw_of(raw, r, "termination") == "termi\u00ad\nnation"


def test_hyphen_kept_before_capital_or_digit():
    # Only "letter-LF-lowercase letter" is treated as a broken word (common practice, no source).
    assert repair_text("Non-\nCompete").text == "Non-\nCompete"
    assert repair_text("pages 3-\n4").text == "pages 3-\n4"


def test_whitespace_and_controls():
    raw = "  The\tTenant \u00a0 shall\x00 pay.\x07  \r\n\r\n\r\n\r\nNext   line \nhere.\x0cEnd  "
    r = repair_text(raw)
    assert r.text == "The Tenant shall pay.\n\nNext line\nhere.\nEnd"
    assert _raw_of(raw, r, "shall pay.") == "shall\x00 pay."
    nl = r.text.index("\n")
    assert raw[r.to_raw[nl]] in "\r\n"


def test_light_mode_keeps_spacing_and_hyphens():
    r = repair_text("a  b-\nc", join_hyphens=False, collapse_spaces=False)
    assert r.text == "a  b-\nc"


def test_map_span_bad_arguments():
    r = repair_text("abc")
    with pytest.raises(ValueError):
        map_span_to_raw(r, 2, 1)
    with pytest.raises(ValueError):
        map_span_to_raw(r, 0, 4)
    assert map_span_to_raw(r, 1, 1) == (1, 1)
    with pytest.raises(ValueError):
        repair_text(b"bytes")  # type: ignore[arg-type]


_ALPHABET = st.sampled_from(list("ab-Z9 .\t\n\r\x00\x0c\u00ad\u00a0\u200b") + list(LIGATURES))


@settings(max_examples=200, deadline=None)
@given(st.text(alphabet=_ALPHABET, max_size=40))
def test_map_is_exact_for_any_string(raw):
    # Property: every repaired character comes from the raw character its map points to.
    r = repair_text(raw)
    assert len(r.to_raw) == len(r.text) + 1 and r.to_raw[-1] == len(raw)
    assert list(r.to_raw) == sorted(r.to_raw)
    for i, ch in enumerate(r.text):
        src = raw[r.to_raw[i]]
        if src in LIGATURES:
            assert ch in LIGATURES[src]
        elif ch in " \n":
            assert src.isspace() or src in "\x0c"
        else:
            assert src == ch
