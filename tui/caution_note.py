"""The standing notice that answers are machine-extracted and need checking (engine.workspace.CAUTION)."""

from __future__ import annotations

from rich.text import Text
from textual.widgets import Static

from engine.workspace import CAUTION


class CautionNote(Static):
    """A one-line band, always visible on the desk and the grid."""

    DEFAULT_CSS = """
    CautionNote {
        height: auto;
        padding: 0 1;
        background: $warning 18%;
        color: $text;
        border-left: thick $warning;
    }
    """

    def __init__(self, **kwargs) -> None:
        text = Text(end="")
        text.append("Caution · ", style="bold")
        text.append(CAUTION)
        super().__init__(text, markup=False, **kwargs)
