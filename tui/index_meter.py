"""Indexing progress (files done/total + current file) and, afterwards, a one-line summary of the folder."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Horizontal
from textual.reactive import reactive
from textual.widgets import ProgressBar, Static

from tui import palette


class IndexMeter(Horizontal):
    """Shows ``done/total`` and the current file while indexing; the outcome once finished."""

    DEFAULT_CSS = """
    IndexMeter { height: 1; padding: 0 1; }
    IndexMeter > #meter-label { width: 1fr; }
    IndexMeter > ProgressBar { width: 34; }
    IndexMeter.-idle > ProgressBar { display: none; }
    """

    done: reactive[int] = reactive(0)
    total: reactive[int | None] = reactive(None)
    current: reactive[str] = reactive("")
    summary: reactive[Text | None] = reactive(None)

    def compose(self) -> ComposeResult:
        yield Static(id="meter-label", markup=False)
        yield ProgressBar(show_eta=False, id="meter-bar")

    def on_mount(self) -> None:
        self._refresh_label()

    def watch_done(self) -> None:
        self._refresh_label()

    def watch_total(self) -> None:
        self._refresh_label()

    def watch_current(self) -> None:
        self._refresh_label()

    def watch_summary(self) -> None:
        self._refresh_label()

    def start(self) -> None:
        self.summary = None
        self.done, self.total, self.current = 0, None, ""
        self.remove_class("-idle")

    def progress(self, done: int, total: int, current: str) -> None:
        self.remove_class("-idle")
        self.summary = None
        self.done, self.total, self.current = done, total, current

    def finish(self, summary: Text) -> None:
        self.add_class("-idle")
        self.summary = summary

    def _refresh_label(self) -> None:
        if not self.children:  # not composed yet
            return
        label = self.query_one("#meter-label", Static)
        if self.summary is not None:
            label.update(self.summary)
            return
        bar = self.query_one(ProgressBar)
        bar.update(total=self.total, progress=self.done)
        text = Text("Indexing ", style="bold", end="")
        text.append(f"{self.done}/{self.total if self.total is not None else '?'} files ")
        if self.current:
            text.append(self.current, palette.MUTED)
        label.update(text)
