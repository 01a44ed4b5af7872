"""Files that could not be indexed (with the reason), and files indexed with warnings."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from tui import palette


class ProblemsScreen(ModalScreen[None]):
    """Read-only list; Escape closes."""

    BINDINGS = [Binding("escape,f", "close", "Close")]

    DEFAULT_CSS = """
    ProblemsScreen { align: center middle; }
    ProblemsScreen > VerticalScroll {
        width: 96; height: 80%; padding: 1 2; border: round $error; background: $surface;
    }
    """

    def __init__(self, failed: list, warnings: list) -> None:
        super().__init__()
        self.failed = list(failed)
        self.warnings = list(warnings)

    def compose(self) -> ComposeResult:
        with VerticalScroll():
            yield Static(self.describe(self.failed, self.warnings), markup=False, id="problems-text")

    def on_mount(self) -> None:
        self.query_one(VerticalScroll).border_title = "Files with problems"

    def action_close(self) -> None:
        self.dismiss(None)

    @staticmethod
    def describe(failed: list, warnings: list) -> Text:
        """``failed``/``warnings``: IngestProblem records (path, reason)."""
        text = Text(end="")
        if not failed and not warnings:
            text.append("Every file in the folder was read without problems.", "bold")
            return text
        text.append(f"Could not be read ({len(failed)}) — not searched:\n", "bold")
        for problem in failed:
            text.append("  ✘ ", palette.DECISION_STYLE["rejected"])
            text.append(problem.path, palette.FILE)
            text.append("\n      " + problem.reason + "\n")
        if warnings:
            text.append(f"\nRead in part ({len(warnings)}) — searched, with gaps:\n", "bold")
            for problem in warnings:
                text.append("  ! ", palette.BAND_STYLE["low"])
                text.append(" ")
                text.append(problem.path, palette.FILE)
                text.append("\n      " + problem.reason + "\n")
        return text
