"""Checklist sweep progress: cells done/total, cells per second and the estimated time left."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import Horizontal
from textual.reactive import reactive
from textual.widgets import ProgressBar, Static

from tui import palette


def eta_words(seconds: float | None) -> str:
    """'about 40 s left' / 'about 3 min left' / 'estimating…'."""
    if seconds is None:
        return "estimating…"
    if seconds < 90:
        return f"about {max(0, round(seconds))} s left"
    if seconds < 5400:
        return f"about {round(seconds / 60)} min left"
    return f"about {seconds / 3600:.1f} h left"


class SweepMeter(Horizontal):
    """While a sweep runs: bar + 'done/total cells · rate · ETA · document'. Otherwise a plain status line."""

    DEFAULT_CSS = """
    SweepMeter { height: 1; padding: 0 1; }
    SweepMeter > #sweep-label { width: 1fr; }
    SweepMeter > ProgressBar { width: 34; }
    SweepMeter.-idle > ProgressBar { display: none; }
    """

    progress: reactive[object | None] = reactive(None)  # an engine.sweep.SweepProgress while running
    note: reactive[Text] = reactive(Text(""))

    def compose(self) -> ComposeResult:
        yield Static(id="sweep-label", markup=False)
        yield ProgressBar(show_eta=False, id="sweep-bar")

    def on_mount(self) -> None:
        self.add_class("-idle")
        self._refresh()

    def watch_progress(self) -> None:
        self._refresh()

    def watch_note(self) -> None:
        self._refresh()

    def running(self, progress) -> None:
        self.remove_class("-idle")
        self.progress = progress

    def idle(self, note: Text) -> None:
        self.add_class("-idle")
        self.progress = None
        self.note = note

    def _refresh(self) -> None:
        if not self.children:  # not composed yet
            return
        label = self.query_one("#sweep-label", Static)
        p = self.progress
        if p is None:
            label.update(self.note)
            return
        self.query_one(ProgressBar).update(total=max(p.total, 1), progress=p.done)
        text = Text("Sweeping ", style="bold", end="")
        text.append(f"{p.done}/{p.total} cells · {p.cells_per_second:.1f} cells/s · {eta_words(p.eta_seconds)} ")
        text.append(p.current_doc, palette.MUTED)
        label.update(text)
