"""Markup safety: file names and questions with square brackets are shown literally, never parsed as markup.

Reference: Rich/Textual markup syntax ("[bold]...[/]" styles text), so a literal "[bold]" on screen proves the
name was not parsed.
"""

from __future__ import annotations

import html

from tests.tui.tui_harness import ask, demo_copy, run_async, running_app, settle
from tui.answer_list import AnswerList
from tui.document_screen import DocumentScreen
from tui.history_screen import HistoryScreen
from tui.question_bar import QuestionBar
from tui.state import Scope

NAME = "[bold]x[/].txt"  # a subfolder "[bold]x[" holding "].txt": its relative path reads as markup
QUESTION = "Which [red]markup[/red] law governs this lease?"


def screen_text(app) -> str:
    """The characters of the rendered screen, from Textual's own SVG export (spaces normalised)."""
    return html.unescape(app.export_screenshot()).replace("\xa0", " ")


@run_async
async def test_brackets_in_names_and_questions_render_literally(tmp_path):
    folder = demo_copy(tmp_path)
    (folder / "[bold]x[").mkdir()
    (folder / "[bold]x[" / "].txt").write_text(
        "SHORT LEASE\n\nThis lease is governed by the laws of the State of Minnesota and markup law rules.\n",
        encoding="utf-8")
    async with running_app(folder) as (app, pilot):
        app.desk.scope = Scope(doc=NAME)
        await pilot.pause()
        assert f"document {NAME}" in app.desk.query_one(QuestionBar).query_one("#scope-chip").content.plain
        await ask(pilot, QUESTION)
        answers = app.desk.query_one(AnswerList).answers
        assert answers and {a.file for a in answers} == {NAME}
        shown = screen_text(app)
        assert NAME in shown and "[red]markup[/red]" in shown
        assert f"document {NAME}" in shown

        await pilot.press("o")
        await settle(pilot)
        assert isinstance(app.screen, DocumentScreen)
        assert NAME in screen_text(app)
        await pilot.press("escape", "escape", "h")
        await pilot.pause()
        assert isinstance(app.screen, HistoryScreen)
        assert "[red]markup[/red]" in screen_text(app)
