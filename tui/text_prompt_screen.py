"""A one-line text dialog (correct an answer, write a note). Returns the text, or None when cancelled."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import Input, Static

from tui import palette


class TextPromptScreen(ModalScreen[str | None]):
    """Enter saves (an empty line is returned as ''), Escape cancels."""

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    DEFAULT_CSS = """
    TextPromptScreen { align: center middle; }
    TextPromptScreen > Vertical {
        width: 84; height: auto; padding: 1 2; border: round $primary; background: $surface;
    }
    TextPromptScreen Static { margin-bottom: 1; }
    """

    def __init__(self, title: str, context: str, value: str = "", hint: str = "") -> None:
        super().__init__()
        self.title_text = title
        self.context_text = context
        self.value = value
        self.hint = hint

    def compose(self) -> ComposeResult:
        with Vertical():
            head = Text(self.title_text, style="bold", end="")
            head.append("\n")
            head.append(self.context_text, palette.MUTED)
            yield Static(head, markup=False)
            yield Input(value=self.value, id="prompt-input")
            yield Static(Text(self.hint or "Enter saves · Escape cancels", style=palette.MUTED), markup=False)

    def on_mount(self) -> None:
        self.query_one(Input).focus()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.dismiss(event.value)

    def action_cancel(self) -> None:
        self.dismiss(None)
