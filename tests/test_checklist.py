"""The checklist file format: items, labels, derived labels and errors with line numbers.

Expected values come from the format written in the ``engine.checklist`` module docstring (this project's own
specification; there is no outside standard for it), marked "(format spec, no outside source)". The limits
(32-character labels, 300-character questions, 200 items) are "(common practice, no source)".
"""

from __future__ import annotations

from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from engine.checklist import (
    MAX_ITEMS,
    MAX_LABEL_CHARS,
    MAX_QUESTION_CHARS,
    Checklist,
    ChecklistError,
    ChecklistItem,
    load_checklist,
    parse_checklist,
    slugify,
)

ROOT = Path(__file__).resolve().parents[1]


def test_starter_checklist_loads():
    checklist = load_checklist(ROOT / "checklists" / "commercial.checklist")
    assert checklist.name == "commercial"  # name = file stem (format spec, no outside source)
    assert len(checklist.items) == 18  # 18 item lines in the committed file (counted by hand)
    assert checklist.items[0] == ChecklistItem("parties", "Who are the parties to the agreement?", 9)
    assert len(set(checklist.labels)) == len(checklist.labels)  # labels unique (format spec, no outside source)


def test_comments_blank_lines_and_separator():
    text = "\ufeff# heading\n\n   # indented comment\nfee :: What is the fee? See clause #4.\n  a-1 ::  x :: y  \n"
    checklist = parse_checklist(text, "mine")
    # '#' starts a comment only as the first non-blank character; split at the first '::'; strip both parts
    # (format spec, no outside source)
    assert checklist == Checklist("mine", (
        ChecklistItem("fee", "What is the fee? See clause #4.", 4),
        ChecklistItem("a-1", "x :: y", 5),
    ))


def test_derived_labels():
    text = ("Who are the parties to the agreement?\n"
            "Who are the parties to the agreement, finally?\n"
            "\u00c9t\u00e9 clause?\n"
            "???\n"
            "who-are-the-parties-to-the-2 :: explicit, and listed after the derived ones\n")
    labels = parse_checklist(text, "x").labels
    # slug of whole words within 32 characters; '-<line>' on a clash; 'q<line>' when no letters or digits;
    # explicit labels reserved first (format spec, no outside source)
    assert labels == ("who-are-the-parties-to-the", "q2", "ete-clause", "q4", "who-are-the-parties-to-the-2")
    assert len(set(labels)) == 5


def test_slugify_keeps_whole_words_within_the_limit():
    # "Supercalifragilistic..." is one 34-letter word: cut to 32 characters (format spec, no outside source)
    assert slugify("Supercalifragilisticexpialidocious terms") == "supercalifragilisticexpialidocio"
    assert slugify("What is the governing law?") == "what-is-the-governing-law"
    assert slugify("---") == ""


@pytest.mark.parametrize(("text", "line", "fragment"), [
    ("a :: ok\nb ::   \n", 2, "empty question"),
    ("# c\nBad_Label :: Which law?\n", 2, "a-z, 0-9"),
    ("Fee :: Which fee?\n", 1, "a-z, 0-9"),
    ("-x :: Which fee?\n", 1, "starting with a letter or digit"),
    (" :: Which fee?\n", 1, "empty label"),
    ("x" * (MAX_LABEL_CHARS + 1) + " :: Which fee?\n", 1, "longer than 32"),
    ("fee :: What fee?\n\nlaw :: Which law?\nfee :: What fee again?\n", 4, "duplicate label 'fee' (first on line 1)"),
    ("ok :: fine\nlong :: " + "w" * (MAX_QUESTION_CHARS + 1) + "\n", 2, "longer than 300"),
    ("".join(f"Question number {i}?\n" for i in range(MAX_ITEMS + 1)), MAX_ITEMS + 1, "more than 200"),
    ("# only a comment\n\n", 0, "no questions"),
])
def test_errors_carry_the_line_number(text, line, fragment):
    # each rule and its line (format spec, no outside source)
    with pytest.raises(ChecklistError) as info:
        parse_checklist(text, "bad")
    assert info.value.line == line
    assert fragment in str(info.value)
    assert (f"line {line}" in str(info.value)) == (line > 0)
    assert isinstance(info.value, ValueError)  # bad input raises ValueError (project rules, no outside source)


def test_limits_are_inclusive():
    # exactly 300 characters and exactly 200 items are allowed (common practice, no source)
    assert len(parse_checklist("q :: " + "w" * MAX_QUESTION_CHARS, "x").items[0].question) == MAX_QUESTION_CHARS
    assert len(parse_checklist("".join(f"Q {i}?\n" for i in range(MAX_ITEMS)), "x").items) == MAX_ITEMS
    assert parse_checklist("x" * MAX_LABEL_CHARS + " :: q", "x").labels == ("x" * MAX_LABEL_CHARS,)


def test_load_checklist_names_the_file(tmp_path):
    path = tmp_path / "leases.checklist"
    path.write_text("rent :: What is the rent?\nrent :: Again?\n", encoding="utf-8")
    with pytest.raises(ChecklistError, match=r"leases\.checklist line 2: duplicate label"):
        load_checklist(path)  # (format spec, no outside source)
    path.write_bytes(b"rent :: caf\xe9?\n")  # Latin-1 byte, not UTF-8 (RFC 3629: 0xE9 must start a 3-byte sequence)
    with pytest.raises(ChecklistError, match="not UTF-8"):
        load_checklist(path)
    with pytest.raises(ValueError, match="cannot read checklist"):
        load_checklist(tmp_path / "missing.checklist")


def test_name_is_required():
    with pytest.raises(ValueError, match="non-empty name"):
        parse_checklist("q?", " ")


@settings(max_examples=40, deadline=None)
@given(st.lists(st.text(alphabet=st.characters(blacklist_categories=("Cs", "Cc", "Cf", "Zl", "Zp")), min_size=1,
                        max_size=60).filter(lambda s: s.strip() and not s.strip().startswith("#") and "::" not in s),
                min_size=1, max_size=12))
def test_any_plain_questions_get_unique_valid_labels(questions):
    checklist = parse_checklist("\n".join(questions), "prop")
    # one item per non-comment line; labels unique, <= 32 chars of a-z, 0-9, '-' (format spec, no outside source)
    assert [i.question for i in checklist.items] == [q.strip() for q in questions]
    assert len(set(checklist.labels)) == len(questions)
    for label in checklist.labels:
        assert 1 <= len(label) <= MAX_LABEL_CHARS and set(label) <= set("abcdefghijklmnopqrstuvwxyz0123456789-")
