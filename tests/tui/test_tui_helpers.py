"""Pure helpers behind the screens: highlights, clauses, snippets, key names, scopes."""

from __future__ import annotations

from pathlib import Path

import pytest

from tui.app import default_export_dir
from tui.help_screen import key_label
from tui.spans import clause_bounds, one_line, snippet, styled, text_under
from tui.state import Scope, SourceSpan


def test_styled_marks_exact_characters_and_never_parses_markup():
    text = styled("[b]rent[/b] is $1,150 per acre", [(12, 25, "bold"), (-5, 3, "italic"), (40, 50, "red")])
    # Rich markup syntax (rich.markup docs): "[b]" would be consumed if parsed; here it stays as characters.
    assert text.plain == "[b]rent[/b] is $1,150 per acre"
    assert text_under(text, "bold") == ["is $1,150 per"]  # Python slicing: plain[12:25]
    assert text_under(text, "italic") == ["[b]"]  # clipped to the text (no negative offsets)
    assert text_under(text, "red") == []


def test_clause_bounds_on_numbered_clauses():
    page = ("14. GOVERNING LAW\n14.1 This Lease is governed by the laws of the State of Minnesota, without\n"
            "regard to conflict rules.\n14.2 Each Party waives jury trial.")
    start = page.index("State of Minnesota")
    lo, hi = clause_bounds(page, start, start + len("State of Minnesota"))
    # Expected by hand: the numbered clause 14.1 up to its full stop (common practice, no source).
    assert page[lo:hi] == ("14.1 This Lease is governed by the laws of the State of Minnesota, without\n"
                           "regard to conflict rules.")
    sentence = "Rent is due monthly. Tenant pays $1,150.00 per acre each year. Taxes are extra."
    s = sentence.index("$1,150.00")
    lo, hi = clause_bounds(sentence, s, s + 9)
    assert sentence[lo:hi] == "Tenant pays $1,150.00 per acre each year."  # a decimal point is not a stop
    with pytest.raises(ValueError):
        clause_bounds("abc", 2, 9)


def test_snippet_and_one_line():
    passage = "The Tenant shall pay Operating Rent of\n$1,150 per acre per year, payable in advance."
    start = passage.index("$1,150")
    text = snippet(passage, start, start + len("$1,150 per acre"), words=3)
    assert text.plain == "…Operating Rent of $1,150 per acre per year, payable…"
    clause = "by giving Landlord not less than ninety (90) days' prior written notice."
    start = clause.index("ninety")
    text = snippet(clause, start, start + len("ninety (90) days"), words=2)
    assert text.plain == "…less than ninety (90) days' prior…"
    assert snippet("(ninety)", 1, 7, words=2).plain == "…(ninety)…"
    assert one_line("State of\n  Minnesota") == "State of Minnesota"


def test_key_labels():
    assert key_label("escape,f1,question_mark") == "Esc / F1 / ?"
    assert key_label("ctrl+r") == "Ctrl+R" and key_label("right_square_bracket") == "]"


def test_scope_and_source_span():
    assert Scope().label == "whole folder" and Scope().is_whole
    assert Scope(doc="a/b.pdf").label == "document a/b.pdf"
    assert Scope(subfolder="vendors").label == "subfolder vendors/"
    with pytest.raises(ValueError):
        Scope(doc="a.pdf", subfolder="vendors")
    span = SourceSpan("a.pdf", 2, "p. 2", start=110, end=115, passage="x" * 50, passage_start=100, answer="xxxxx")
    assert span.local == (10, 15)  # engine/types.py: passage starts at passage_start of the page text


def test_default_export_dir_stays_out_of_the_reviewed_folder(tmp_path, monkeypatch):
    folder = (tmp_path / "room").resolve()
    (folder / "sub").mkdir(parents=True)
    monkeypatch.chdir(folder / "sub")
    assert default_export_dir(folder) == folder.parent
    monkeypatch.chdir(tmp_path)
    assert default_export_dir(folder) == Path(tmp_path).resolve()
