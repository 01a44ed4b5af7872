"""Flows 4-5: open an answer's document at the cited page, page through it, find in it, come back; scope.

Oracles: Workspace.pages (engine/types.py: page.text[start:end] is the cited text) and Python's ``re`` module
for the find-in-document hit count.
"""

from __future__ import annotations

import re

from tests.tui.tui_harness import GOVERNING_LAW, ask, demo_copy, fake_workspace, run_async, running_app, settle
from tui import palette
from tui.answer_list import AnswerList
from tui.document_screen import DocumentScreen
from tui.question_bar import QuestionBar
from tui.scope_screen import ScopeScreen
from tui.spans import text_under
from tui.state import Scope, SourceSpan


@run_async
async def test_jump_page_find_and_back(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        await ask(pilot, GOVERNING_LAW)
        before = list(app.desk.query_one(AnswerList).answers)
        best = before[0]
        await pilot.press("o")
        await settle(pilot)
        screen = app.screen
        assert isinstance(screen, DocumentScreen)
        pages = fake_workspace(folder).pages(best.file)
        assert screen.pages[screen.page_index].number == best.page  # opened at the cited page
        cited = pages[screen.page_index].text[best.start:best.end]
        assert text_under(screen.page_text, palette.SPAN) == [cited]
        # The cited line is on screen: the body scrolled to it.
        body = screen.query_one("#doc-body")
        line_no = pages[screen.page_index].text.count("\n", 0, best.start)
        line = body.children[line_no]
        assert body.scroll_y <= line.virtual_region.y < body.scroll_y + body.scrollable_content_region.height

        # Page through: next, then back.
        await pilot.press("right_square_bracket")
        await settle(pilot)
        assert screen.page_index == best.page  # 0-based index of the page after the cited one
        assert screen.page_text.plain == pages[best.page].text
        assert text_under(screen.page_text, palette.SPAN) == []
        await pilot.press("left_square_bracket")
        await settle(pilot)
        assert screen.pages[screen.page_index].number == best.page

        # Find: every case-insensitive hit over all pages, walked with n / N across pages.
        await pilot.press("slash")
        await pilot.press(*"Tenant", "enter")
        await settle(pilot)
        expected = sum(len(re.findall("tenant", p.text, re.IGNORECASE)) for p in pages)  # reference: re
        assert len(screen.matches) == expected and expected > 5
        first = screen.match_index
        page_i, start, end = screen.matches[first]
        assert screen.page_index == page_i
        assert text_under(screen.page_text, palette.MATCH_NOW) == [pages[page_i].text[start:end]]
        await pilot.press("n")
        await settle(pilot)
        assert screen.match_index == (first + 1) % expected
        await pilot.press("N")
        await settle(pilot)
        assert screen.match_index == first
        await pilot.press("c")
        await settle(pilot)
        assert text_under(screen.page_text, palette.SPAN) == [cited]

        # Back to the answers, unchanged.
        await pilot.press("escape")
        await pilot.pause()
        assert app.screen is app.desk
        assert app.desk.query_one(AnswerList).answers == before


@run_async
async def test_scope_to_document_and_subfolder_then_clear(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        await pilot.press("escape")  # out of the question box
        await pilot.press("s")
        await settle(pilot)
        assert isinstance(app.screen, ScopeScreen)
        await pilot.press(*"om_agr", "enter")
        await pilot.pause()
        assert app.desk.scope == Scope(doc="vendors/om_agreement.docx")
        chip = app.desk.query_one(QuestionBar).query_one("#scope-chip").content.plain
        assert "document vendors/om_agreement.docx" in chip  # shown visibly beside the question box
        await ask(pilot, "What is the effective date of the agreement?")
        answers = app.desk.query_one(AnswerList).answers
        assert answers and {a.file for a in answers} == {"vendors/om_agreement.docx"}
        assert app.store.history()[0].scope == "document vendors/om_agreement.docx"  # engine AskResult.scope

        await pilot.press("s")
        await settle(pilot)
        await pilot.press(*"vendors", "enter")  # the first match: the subfolder itself, before its documents
        await pilot.pause()
        assert app.desk.scope == Scope(subfolder="vendors")
        await ask(pilot, "What is the effective date of the agreement?")
        answers = app.desk.query_one(AnswerList).answers
        assert answers and all(a.file.startswith("vendors/") for a in answers)

        await pilot.press("w")
        await pilot.pause()
        assert app.desk.scope == Scope()
        await ask(pilot, "What is the effective date of the agreement?")
        files = {a.file for a in app.desk.query_one(AnswerList).answers}
        direct = fake_workspace(folder).ask("What is the effective date of the agreement?")
        assert files == {a.citation.file for a in direct.answers}  # oracle: unscoped engine ask


@run_async
async def test_a_very_long_page_is_shown_in_blocks_and_still_scrolled_to_the_span(tmp_path):
    folder = tmp_path / "long"
    folder.mkdir()
    lines = [f"Line {i}: the parties agree to the ordinary terms of clause {i}." for i in range(1500)]
    lines[1234] = "Line 1234: the Supplier's liability is capped at two hundred thousand dollars."
    (folder / "long_terms.txt").write_text("\n".join(lines) + "\n", encoding="utf-8")
    async with running_app(folder) as (app, pilot):
        page = fake_workspace(folder).pages("long_terms.txt")[0]
        start = page.text.index("two hundred thousand dollars")
        end = start + len("two hundred thousand dollars")
        target = SourceSpan("long_terms.txt", page.number, page.locator, start, end, page.text, 0, page.text[start:end])
        await app.push_screen(DocumentScreen(app.workspace, "long_terms.txt", target))
        await settle(pilot)
        screen = app.screen
        body = screen.query_one("#doc-body")
        assert len(body.children) <= 400 < page.text.count("\n")  # grouped (DocumentScreen.MAX_LINE_WIDGETS)
        assert text_under(screen.page_text, palette.SPAN) == ["two hundred thousand dollars"]
        block = next(w for w in body.children if "two hundred thousand dollars" in w.content.plain)
        top = block.virtual_region.y
        assert body.scroll_y <= top + block.virtual_region.height and top < body.scroll_y + body.size.height
