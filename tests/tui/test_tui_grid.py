"""Checklist grid: sweep from the screen, open a cell's source, review cells, filter.

Oracles: engine.checklist.load_checklist (the items) × Workspace.documents() for the grid's shape, the
ReviewStore for decisions, and the stored page text for the highlight.
"""

from __future__ import annotations

import threading

from engine.checklist import load_checklist
from engine.review_store import ReviewStore
from engine.workspace import Workspace
from tests.fakes import FAKE_CALIBRATION, FakeReader
from tests.tui.tui_harness import demo_copy, fake_workspace, run_async, running_app, settle
from textual.widgets import DataTable, ProgressBar
from tui import palette
from tui.app import DEFAULT_CHECKLIST
from tui.document_screen import DocumentScreen
from tui.grid_screen import GridScreen, is_low
from tui.source_preview import SourcePreview
from tui.spans import text_under
from tui.sweep_meter import SweepMeter, eta_words

SMALL = "parties :: Who are the parties to the agreement?\ngoverning-law :: Which law governs the agreement?\n"


async def _sweep(pilot) -> GridScreen:
    await pilot.press("escape", "g")
    await settle(pilot)
    grid = pilot.app.screen
    assert isinstance(grid, GridScreen)
    await pilot.press("p")
    for _ in range(300):
        await pilot.pause(0.05)
        if not grid.sweeping:
            break
    await settle(pilot)
    return grid


@run_async
async def test_sweep_fills_the_grid_and_cells_can_be_reviewed(tmp_path):
    folder = demo_copy(tmp_path)
    checklist_file = tmp_path / "small.checklist"
    checklist_file.write_text(SMALL, encoding="utf-8")
    async with running_app(folder, checklist=checklist_file) as (app, pilot):
        grid = await _sweep(pilot)
        checklist = load_checklist(checklist_file)
        documents = fake_workspace(folder).documents()
        assert len(grid.cells) == len(documents) * len(checklist.items)  # one cell per document × question
        table = grid.query_one(DataTable)
        assert table.row_count == len(documents) and len(table.columns) == len(checklist.items)
        assert grid.last_report is not None and not grid.last_report.stopped

        # The highlighted cell's source is shown with the answer characters marked.
        target = next(c for c in grid.cells.values() if not c.abstained and c.label == "governing-law")
        table.focus()
        table.move_cursor(row=table.get_row_index(target.doc_path), column=table.get_column_index(target.label))
        await pilot.pause()
        cell = grid.current
        assert cell == target
        preview = grid.query_one(SourcePreview)
        page = next(p for p in fake_workspace(folder).pages(cell.doc_path)
                    if (p.number == cell.page if cell.page is not None else p.locator == cell.locator))
        assert text_under(preview.passage_text, palette.SPAN) == [page.text[cell.start:cell.end]]

        # Open it: the document at the cited page, the span highlighted.
        await pilot.press("enter")
        await settle(pilot)
        assert isinstance(app.screen, DocumentScreen)
        assert text_under(app.screen.page_text, palette.SPAN) == [page.text[cell.start:cell.end]]
        await pilot.press("escape")
        await pilot.pause()
        assert app.screen is grid

        # Review: accept, then correct; both read back from a second store connection.
        await pilot.press("a")
        await pilot.pause()
        with ReviewStore(folder) as other:
            assert other.cell(cell.cell_id).decision == "accepted"
        await pilot.press("e")
        await pilot.pause()
        app.screen.query_one("#prompt-input").value = "the State of Minnesota"
        await pilot.press("enter")
        await pilot.pause()
        with ReviewStore(folder) as other:
            saved = other.cell(cell.cell_id)
        assert (saved.decision, saved.corrected_text) == ("corrected", "the State of Minnesota")
        assert "the State of" in str(table.get_cell(cell.doc_path, cell.label))

        # Filters: unreviewed only hides the decided cell; low only keeps rows with a low/unanswered cell.
        await pilot.press("v")
        await pilot.pause()
        assert str(table.get_cell(cell.doc_path, cell.label)) == ""
        await pilot.press("v", "l")
        await pilot.pause()
        rows_with_low = {c.doc_path for c in grid.cells.values() if is_low(c)}
        assert set(k.value for k in table.rows) == rows_with_low

        # Resume: nothing changed, so a second sweep reads no cell again (ReviewStore.done_keys contract).
        await pilot.press("l")
        await pilot.press("p")
        for _ in range(300):
            await pilot.pause(0.05)
            if not grid.sweeping:
                break
        await settle(pilot)
        assert grid.last_report.cells_swept == 0
        assert grid.last_report.cells_skipped == len(documents) * len(checklist.items)


def test_default_checklist_and_eta_words():
    assert DEFAULT_CHECKLIST.is_file()  # checklists/commercial.checklist ships with the repository
    # Rounding to whole seconds / minutes (common practice, no source).
    assert eta_words(None) == "estimating…"
    assert eta_words(42.4) == "about 42 s left"
    assert eta_words(600) == "about 10 min left"


class GatedReader(FakeReader):
    """The fake reader, but its second ``read_pairs`` call waits for ``gate`` (a sweep batch in flight)."""

    def __init__(self) -> None:
        super().__init__()
        self.gate = threading.Event()
        self.waiting = threading.Event()

    def read_pairs(self, pairs, n_best=5):
        if self.calls == 1:
            self.waiting.set()
            self.gate.wait(10)
        return super().read_pairs(pairs, n_best)


@run_async
async def test_sweep_progress_pause_and_resume(tmp_path):
    folder = demo_copy(tmp_path)
    reader = GatedReader()
    async with running_app(folder, workspace=Workspace(folder, reader=reader, calibration=FAKE_CALIBRATION)) as (app, pilot):
        await pilot.press("escape", "g")
        await settle(pilot)
        grid = app.screen
        await pilot.press("p")
        try:
            for _ in range(200):
                await pilot.pause(0.05)
                if reader.waiting.is_set() and grid.query_one(SweepMeter).progress is not None:
                    break
            progress = grid.query_one(SweepMeter).progress
            label = grid.query_one("#sweep-label").content.plain
            # engine.sweep.SweepProgress after the first batch: done/total, a rate and an ETA.
            assert 0 < progress.done < progress.total
            assert f"{progress.done}/{progress.total} cells" in label
            assert f"{progress.cells_per_second:.1f} cells/s" in label and eta_words(progress.eta_seconds) in label
            assert grid.query_one(ProgressBar).progress == progress.done
            await pilot.press("p")  # pause: the sweep stops before its next batch
        finally:
            reader.gate.set()
        for _ in range(200):
            await pilot.pause(0.05)
            if not grid.sweeping:
                break
        await settle(pilot)
        first = grid.last_report
        total = len(fake_workspace(folder).documents()) * len(load_checklist(DEFAULT_CHECKLIST).items)
        assert first.stopped and 0 < first.cells_swept < total
        assert "paused" in grid.query_one("#sweep-label").content.plain
        await pilot.press("p")  # resume
        for _ in range(300):
            await pilot.pause(0.05)
            if not grid.sweeping:
                break
        await settle(pilot)
        second = grid.last_report
        assert not second.stopped and second.cells_skipped == first.cells_swept
        assert second.cells_skipped + second.cells_swept == total == len(grid.cells)


@run_async
async def test_an_abstaining_cell_shows_its_closest_span_marked_below_the_threshold(tmp_path):
    from dataclasses import replace

    from tui.grid_screen import cell_text

    folder = demo_copy(tmp_path)
    checklist_file = tmp_path / "small.checklist"
    checklist_file.write_text(SMALL, encoding="utf-8")
    strict = replace(FAKE_CALIBRATION, null_margin_threshold=-100.0)  # every cell abstains
    workspace = Workspace(folder, reader=FakeReader(), calibration=strict)
    async with running_app(folder, checklist=checklist_file, workspace=workspace) as (app, pilot):
        grid = await _sweep(pilot)
        target = next(c for c in grid.cells.values() if c.below_threshold)
        assert target.abstained and target.low_confidence
        # Oracle: the store holds the same cell.
        with ReviewStore(folder) as store:
            assert store.cell(target.cell_id) == target
        shown = cell_text(target, 60)
        assert target.answer[:10] in shown.plain
        assert any(palette.BELOW_THRESHOLD in str(span.style) for span in shown.spans)
        table = grid.query_one(DataTable)
        table.focus()
        table.move_cursor(row=table.get_row_index(target.doc_path), column=table.get_column_index(target.label))
        await pilot.pause()
        head = str(grid.query_one("#cell-head").render())
        assert "below the answer threshold" in head
        assert text_under(grid.query_one(SourcePreview).passage_text, palette.SPAN) == [
            target.passage[target.start - target.passage_start: target.end - target.passage_start]]
