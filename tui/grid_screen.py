"""Checklist grid: documents (rows) × checklist questions (columns), one short answer per cell.

Each cell shows a decision glyph and the answer in its confidence band colour (tui.palette.BAND_FG); the
highlighted cell's source is shown below with the answer characters marked. A sweep (engine.sweep.run_sweep)
runs in a thread worker, writes cells to the review store as it goes and can be paused and resumed.
"""

from __future__ import annotations

import sqlite3
from pathlib import Path

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.message import Message
from textual.reactive import reactive
from textual.screen import Screen
from textual.widgets import DataTable, Footer, Static
from textual.worker import get_current_worker

from tui import palette
from tui.caution_note import CautionNote
from tui.document_screen import DocumentScreen
from tui.source_preview import SourcePreview
from tui.spans import band_legend
from tui.state import span_of_cell
from tui.sweep_meter import SweepMeter
from tui.text_prompt_screen import TextPromptScreen

CELL_WIDTH = 18
STORE_ERRORS = (ValueError, sqlite3.Error, OSError)


def cell_text(cell, width: int = CELL_WIDTH) -> Text:
    """Glyph + short answer in its band colour; '·' not swept yet; '—' no answer found; the closest span of an
    abstained cell in the below-threshold style."""
    if cell is None:
        return Text("·", style=palette.MUTED, end="")
    glyph = palette.DECISION_GLYPH.get(cell.decision or "", " ")
    out = Text(glyph + " ", style=palette.DECISION_STYLE.get(cell.decision or "", ""), end="")
    if cell.decision == "corrected" and cell.corrected_text:
        words, style = cell.corrected_text, "bold " + palette.BAND_FG["fair"]
    elif cell.answer is None:
        words, style = "— no answer", palette.BAND_FG["none"]
    elif cell.below_threshold:
        words, style = cell.answer, palette.BELOW_THRESHOLD
    else:
        words, style = cell.answer, palette.BAND_FG[palette.band(cell.score, cell.low_confidence)]
    words = " ".join(words.split())
    if len(words) > width - 2:
        words = words[: width - 3] + "…"
    out.append(words, style + (" strike" if cell.decision == "rejected" else ""))
    return out


def is_low(cell) -> bool:
    return cell is not None and palette.band(cell.score, cell.low_confidence) in ("low", "none")


class GridScreen(Screen[None]):
    """Installed once by the app, so a running sweep survives leaving the screen."""

    BINDINGS = [
        Binding("escape", "back", "Desk", tooltip="Back to the desk (a running sweep goes on)"),
        Binding("p", "sweep", "Sweep", tooltip="Run, pause or resume the checklist sweep"),
        Binding("l", "toggle('low_only')", "Low", tooltip="Show only low-confidence or unanswered cells"),
        Binding("v", "toggle('unreviewed_only')", "Unreviewed", tooltip="Show only cells without a decision"),
        Binding("o", "open", "Open", tooltip="Open the document at the cited page"),
        Binding("a", "review('accepted')", "Accept"),
        Binding("r", "review('rejected')", "Reject"),
        Binding("e", "review('corrected')", "Correct", tooltip="Edit the cell's answer text"),
        Binding("n", "review('note')", "Note"),
        Binding("u", "review('clear')", "Undo", tooltip="Clear the decision"),
    ]

    DEFAULT_CSS = """
    GridScreen #grid-head { height: auto; padding: 0 1; background: $panel; }
    GridScreen DataTable { height: auto; max-height: 60%; border: round $panel; }
    GridScreen DataTable:focus { border: round $primary; }
    GridScreen #cell-head { height: auto; padding: 0 1; }
    GridScreen SourcePreview { height: 1fr; }
    """

    low_only: reactive[bool] = reactive(False)
    unreviewed_only: reactive[bool] = reactive(False)
    sweeping: reactive[bool] = reactive(False)

    class GridData(Message):
        def __init__(self, documents: list[str], cells: list, error: str = "") -> None:
            super().__init__()
            self.documents, self.cells, self.error = documents, cells, error

    class SweepStep(Message):
        def __init__(self, progress) -> None:
            super().__init__()
            self.progress = progress

    class SweepDone(Message):
        def __init__(self, report, error: str = "") -> None:
            super().__init__()
            self.report, self.error = report, error

    def __init__(self, checklist_path: Path) -> None:
        super().__init__()
        self.checklist_path = Path(checklist_path)
        self.checklist = None
        self.problem = ""
        self.documents: list[str] = []
        self.cells: dict[tuple[str, str], object] = {}
        self.last_report = None  # the SweepReport of the last sweep run from this screen

    def compose(self) -> ComposeResult:
        yield CautionNote()
        yield Static(id="grid-head", markup=False)
        yield SweepMeter()
        yield DataTable(id="grid-table", cursor_type="cell", zebra_stripes=True)
        yield Static(id="cell-head", markup=False)
        yield SourcePreview()
        yield Footer(compact=True)

    def on_mount(self) -> None:
        from engine.checklist import load_checklist

        try:
            self.checklist = load_checklist(self.checklist_path)
        except ValueError as error:
            self.problem = f"Cannot use the checklist: {error}"
        self._head()
        self.query_one(DataTable).focus()
        if self.checklist is not None:
            self.load_grid()

    # Handlers --------------------------------------------------------------------------------------
    def watch_low_only(self) -> None:
        self._fill()

    def watch_unreviewed_only(self) -> None:
        self._fill()

    def watch_sweeping(self) -> None:
        self.refresh_bindings()

    def on_grid_screen_grid_data(self, message: GridData) -> None:
        if message.error:
            self.problem = message.error
        self.documents = list(message.documents)
        self.cells = {(c.doc_path, c.label): c for c in message.cells}
        for doc in sorted({c.doc_path for c in message.cells} - set(self.documents)):
            self.documents.append(doc)
        if not self.sweeping and self.last_report is None:
            expected = len(self.documents) * len(self.checklist.items)
            note = (f"{len(self.cells)} of {expected} cells stored; p sweeps the missing or changed ones."
                    if self.cells else "Press p to sweep the checklist over every document.")
            self.query_one(SweepMeter).idle(Text(note, style=palette.MUTED))
        self._fill()

    def on_grid_screen_sweep_step(self, message: SweepStep) -> None:
        self.query_one(SweepMeter).running(message.progress)
        self.load_grid()

    def on_grid_screen_sweep_done(self, message: SweepDone) -> None:
        self.sweeping = False
        self.last_report = message.report
        meter = self.query_one(SweepMeter)
        r = message.report
        if message.error:
            meter.idle(Text(f"Sweep stopped by an error: {message.error}", style=palette.BAND_STYLE["low"]))
        elif r.stopped:
            meter.idle(Text(f"Sweep paused after {r.cells_swept} cells; press p to resume.", style="bold"))
        else:
            meter.idle(Text(f"Sweep complete: {r.cells_total} cells ({r.cells_swept} read now, "
                            f"{r.cells_skipped} already up to date, {r.abstained} without an answer).",
                            style=palette.MUTED))
        self.load_grid()

    def on_data_table_cell_highlighted(self, event: DataTable.CellHighlighted) -> None:
        self._show_cell()

    def on_data_table_cell_selected(self, event: DataTable.CellSelected) -> None:
        event.stop()
        self.action_open()

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action in ("open", "review"):
            cell = self.current
            if cell is None:
                return False
            return span_of_cell(cell) is not None if action == "open" else True
        if action == "sweep":
            return self.checklist is not None
        return True

    # Actions ---------------------------------------------------------------------------------------
    def action_back(self) -> None:
        self.app.pop_screen()

    def action_toggle(self, name: str) -> None:
        setattr(self, name, not getattr(self, name))
        self._head()

    def action_sweep(self) -> None:
        if self.checklist is None:
            return
        if self.sweeping:
            for worker in self.workers:
                if worker.group == "sweep":
                    worker.cancel()
            self.query_one(SweepMeter).idle(Text("Pausing after the current batch…", style="bold"))
            return
        self.sweeping = True
        self.query_one(SweepMeter).idle(Text("Starting the sweep…", style="bold"))
        self.sweep()

    def action_open(self) -> None:
        cell = self.current
        span = span_of_cell(cell) if cell is not None else None
        if span is not None:
            self.app.push_screen(DocumentScreen(self.app.workspace, span.file, span))

    def action_review(self, kind: str) -> None:
        cell, store = self.current, self.app.store
        if cell is None:
            return
        if kind in ("accepted", "rejected"):
            self._save(lambda: store.set_cell_decision(cell.cell_id, kind))
        elif kind == "clear":
            self._save(lambda: store.set_cell_decision(cell.cell_id, None))
        elif kind == "corrected":
            def corrected(text: str | None) -> None:
                if text is not None and text.strip():
                    self._save(lambda: store.set_cell_decision(cell.cell_id, "corrected",
                                                               corrected_text=text.strip()))
            self.app.push_screen(TextPromptScreen(f"Correct: {cell.question}", f"{cell.doc_path}",
                                                  cell.corrected_text or cell.answer or ""), corrected)
        elif kind == "note":
            def noted(text: str | None) -> None:
                if text is not None:
                    self._save(lambda: store.set_cell_note(cell.cell_id, text))
            self.app.push_screen(TextPromptScreen(f"Note: {cell.question}", cell.doc_path, cell.note or "",
                                                  "Enter saves (an empty note clears it) · Escape cancels"), noted)

    # Workers ---------------------------------------------------------------------------------------
    @work(thread=True, exclusive=True, group="grid")
    def load_grid(self) -> None:
        worker = get_current_worker()
        try:
            documents = self.app.workspace.documents()
        except Exception as error:  # noqa: BLE001 - no index yet, or it is being rebuilt
            documents, problem = [], f"Documents not available yet ({error})."
        else:
            problem = ""
        cells = self.app.store.cells(self.checklist.name)
        if not worker.is_cancelled:
            self.post_message(self.GridData(documents, cells, problem))

    @work(thread=True, exclusive=True, group="sweep")
    def sweep(self) -> None:
        from engine.sweep import run_sweep

        worker = get_current_worker()
        try:
            report = run_sweep(self.app.workspace, self.checklist,
                               progress=lambda p: self.post_message(self.SweepStep(p)),
                               should_stop=lambda: worker.is_cancelled)
        except Exception as error:  # noqa: BLE001
            self.post_message(self.SweepDone(None, f"{type(error).__name__}: {error}"))
            return
        self.post_message(self.SweepDone(report))

    # Helpers ---------------------------------------------------------------------------------------
    @property
    def current(self):
        table = self.query_one(DataTable)
        if not table.row_count or not table.columns:
            return None
        try:
            key = table.coordinate_to_cell_key(table.cursor_coordinate)
        except Exception:  # noqa: BLE001 - cursor outside the grid while it is rebuilt
            return None
        return self.cells.get((key.row_key.value, key.column_key.value))

    def _visible(self, cell) -> bool:
        if self.low_only and not is_low(cell):
            return False
        if self.unreviewed_only and (cell is None or cell.decision is not None):
            return False
        return True

    def _fill(self) -> None:
        if not self.children or self.checklist is None:
            self._head()
            return
        table = self.query_one(DataTable)
        keep = None
        if table.row_count and table.columns:
            try:
                key = table.coordinate_to_cell_key(table.cursor_coordinate)
                keep = (key.row_key.value, key.column_key.value)
            except Exception:  # noqa: BLE001
                keep = None
        labels = list(self.checklist.labels)
        table.clear(columns=True)
        for label in labels:
            table.add_column(Text(label, style="bold"), key=label, width=CELL_WIDTH)
        for doc in self.documents:
            row = [self.cells.get((doc, label)) for label in labels]
            if (self.low_only or self.unreviewed_only) and not any(self._visible(c) for c in row):
                continue
            cells = [cell_text(c) if self._visible(c) else Text("") for c in row]
            table.add_row(*cells, key=doc, label=Text(doc, style=palette.FILE))
        if keep is not None and keep[0] in table.rows:
            table.move_cursor(row=table.get_row_index(keep[0]), column=table.get_column_index(keep[1]),
                              animate=False)
        self._head()
        self._show_cell()

    def _save(self, call) -> None:
        try:
            updated = call()
        except STORE_ERRORS as error:
            self.notify(f"Not saved: {error}", severity="error", markup=False)
            return
        self.cells[(updated.doc_path, updated.label)] = updated
        table = self.query_one(DataTable)
        if updated.doc_path in table.rows:
            table.update_cell(updated.doc_path, updated.label,
                              cell_text(updated) if self._visible(updated) else Text(""))
        self._head()
        self._show_cell()

    def _show_cell(self) -> None:
        if not self.children:  # not composed yet
            return
        cell = self.current
        head = self.query_one("#cell-head", Static)
        preview = self.query_one(SourcePreview)
        if cell is None:
            head.update(Text("No cell here yet: press p to sweep.", style=palette.MUTED))
            preview.span = None
            return
        text = Text(cell.label + ": ", style="bold", end="")
        text.append(cell.question)
        text.append("\n")
        if cell.answer is None:
            text.append("No answer found in this document.", "italic")
        else:
            if cell.below_threshold:
                text.append("No answer found in this document. Closest span, below the answer threshold (the reader "
                            "doubts it; read the source):\n", palette.BELOW_THRESHOLD)
            text.append_text(cell_text(cell, 60))
            text.append(f"  {round((cell.score or 0) * 100)}%", palette.MUTED)
            if cell.low_confidence:
                text.append(" LOW", palette.BAND_STYLE["low"])
        if cell.note:
            text.append("  note: ", palette.MUTED)
            text.append(cell.note, "italic")
        head.update(text)
        preview.span = span_of_cell(cell)
        self.refresh_bindings()

    def _head(self) -> None:
        if not self.children:  # not composed yet
            return
        head = self.query_one("#grid-head", Static)
        if self.checklist is None:
            head.update(Text(self.problem or "No checklist.", style=palette.BAND_STYLE["low"]))
            return
        cells = list(self.cells.values())
        text = Text("Checklist ", style=palette.MUTED, end="")
        text.append(self.checklist.name, "bold")
        text.append(f" · {len(self.checklist.items)} questions × {len(self.documents)} documents", palette.MUTED)
        text.append(f" · {len(cells)} cells · {sum(is_low(c) for c in cells)} low · "
                    f"{sum(c.decision is None for c in cells)} unreviewed", palette.MUTED)
        shown = [name for flag, name in ((self.low_only, "low only"), (self.unreviewed_only, "unreviewed only"))
                 if flag]
        text.append(" · showing: ", palette.MUTED)
        text.append(", ".join(shown) or "all", "bold")
        text.append("\n")
        text.append_text(band_legend())
        if self.problem:
            text.append("\n" + self.problem, palette.BAND_STYLE["low"])
        head.update(text)
