"""SVG snapshots of the main screens at 110x36 (pytest-textual-snapshot). Regenerate with --snapshot-update
after a deliberate change, and look at the new SVGs before committing them."""

from __future__ import annotations

from pathlib import Path

from tests.tui.tui_harness import GOVERNING_LAW, ask, settle
from textual.widgets import Input

APPS = Path(__file__).parent / "snapshot_apps"
SNAP_SIZE = (110, 36)


async def _ready(pilot) -> None:
    await settle(pilot)
    pilot.app.desk.query_one(Input).cursor_blink = False


async def _answers(pilot) -> None:
    await _ready(pilot)
    await ask(pilot, GOVERNING_LAW)


def test_snapshot_empty_desk(snap_compare):
    assert snap_compare(APPS / "desk_app.py", terminal_size=SNAP_SIZE, run_before=_ready)


def test_snapshot_answers_with_preview(snap_compare):
    assert snap_compare(APPS / "desk_app.py", terminal_size=SNAP_SIZE, run_before=_answers)


def test_snapshot_abstention_with_closest_spans(snap_compare):
    assert snap_compare(APPS / "abstaining_desk_app.py", terminal_size=SNAP_SIZE, run_before=_answers)


def test_snapshot_document_view(snap_compare):
    async def run_before(pilot) -> None:
        await _answers(pilot)
        await pilot.press("o")
        await settle(pilot)

    assert snap_compare(APPS / "desk_app.py", terminal_size=SNAP_SIZE, run_before=run_before)


def test_snapshot_help(snap_compare):
    async def run_before(pilot) -> None:
        await _ready(pilot)
        await pilot.press("f1")
        await pilot.pause()

    assert snap_compare(APPS / "desk_app.py", terminal_size=SNAP_SIZE, run_before=run_before)


def test_snapshot_grid(snap_compare):
    async def run_before(pilot) -> None:
        await _ready(pilot)
        await pilot.press("escape", "g")
        await settle(pilot)

    assert snap_compare(APPS / "grid_app.py", terminal_size=SNAP_SIZE, run_before=run_before)
