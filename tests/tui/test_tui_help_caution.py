"""Flows 9-10: the key list, context-dependent footer, the command palette, and the standing caution notice.

Oracles: the classes' own BINDINGS (every key must be listed) and engine.workspace.CAUTION (the exact text).
"""

from __future__ import annotations

from engine.workspace import CAUTION
from tests.tui.tui_harness import GOVERNING_LAW, ask, demo_copy, run_async, running_app, settle
from textual.widgets import Static
from tui.answer_list import AnswerList
from tui.app import ExcerptorApp
from tui.caution_note import CautionNote
from tui.commands import COMMANDS, ExcerptorCommands
from tui.desk_screen import DeskScreen
from tui.document_screen import DocumentScreen
from tui.export_screen import ExportScreen
from tui.grid_screen import GridScreen
from tui.help_screen import HelpScreen, key_label
from tui.history_screen import HistoryScreen


def footer_actions(app) -> set[str]:
    """Actions the footer would show now: the screen's active bindings that are shown and enabled."""
    return {b.binding.action for b in app.screen.active_bindings.values() if b.binding.show and b.enabled}


@run_async
async def test_help_lists_every_key_and_the_footer_follows_focus(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        # Typing a question: letter commands are hidden (they would be typed), Escape is offered.
        typing = footer_actions(app)
        assert "history" not in typing and "leave" in typing
        await ask(pilot, GOVERNING_LAW)
        on_answers = footer_actions(app)  # the answer list has focus after asking
        assert {"jump", "review('accepted')", "review('rejected')", "review('corrected')", "history",
                "export", "grid"} <= on_answers
        assert "clear_scope" not in on_answers  # nothing to clear while the scope is the whole folder

        await pilot.press("f1")
        await pilot.pause()
        assert isinstance(app.screen, HelpScreen)
        listed = app.screen.query_one("#help-text", Static).content.plain
        for owner in (ExcerptorApp, DeskScreen, AnswerList, DocumentScreen, GridScreen):
            for binding in owner.BINDINGS:
                assert key_label(binding.key) in listed, (owner.__name__, binding.key)
                assert (binding.tooltip or binding.description) in listed
        await pilot.press("escape")
        await pilot.pause()
        assert app.screen is app.desk


@run_async
async def test_command_palette_offers_the_main_actions(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        provider = ExcerptorCommands(app.screen)
        titles = [hit.text or str(hit.display) async for hit in provider.discover()]
        assert titles == [title for title, _, _ in COMMANDS]
        for _, _, action in COMMANDS:  # every entry names a real app action
            assert callable(getattr(app, f"action_{action}"))
        hits = [hit async for hit in provider.search("history")]
        assert hits and hits[0].help == COMMANDS[3][1]

        await pilot.press("ctrl+p")
        await pilot.pause()
        await pilot.press(*"histo")
        await pilot.pause(0.2)
        await pilot.press("enter")
        await settle(pilot)
        assert isinstance(app.screen, HistoryScreen)
        await pilot.press("escape")
        await pilot.press("ctrl+p")
        await pilot.pause()
        await pilot.press(*"expor")
        await pilot.pause(0.2)
        await pilot.press("enter")
        await settle(pilot)
        assert isinstance(app.screen, ExportScreen)


@run_async
async def test_caution_is_visible_on_the_desk_and_the_grid(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        note = app.desk.query_one(CautionNote)
        assert CAUTION in note.content.plain  # the engine's exact wording
        assert note.region.height >= 1 and note.region.y == 0  # on screen, at the top
        await pilot.press("escape", "g")
        await settle(pilot)
        grid_note = app.screen.query_one(CautionNote)
        assert CAUTION in grid_note.content.plain and grid_note.region.height >= 1
