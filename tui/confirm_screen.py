"""A yes/no question. Returns True only for an explicit yes."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Static


class ConfirmScreen(ModalScreen[bool]):
    """``y`` confirms; ``n`` or Escape declines. The focused button starts on "Keep" (the safe choice)."""

    BINDINGS = [
        Binding("y", "answer(True)", "Yes"),
        Binding("n", "answer(False)", "No"),
        Binding("escape", "answer(False)", "Cancel"),
    ]

    DEFAULT_CSS = """
    ConfirmScreen { align: center middle; }
    ConfirmScreen > Vertical {
        width: 72; height: auto; padding: 1 2; border: round $error; background: $surface;
    }
    ConfirmScreen Horizontal { height: auto; margin-top: 1; }
    ConfirmScreen Button { margin-right: 2; }
    """

    def __init__(self, question: str, yes: str = "Yes", no: str = "No") -> None:
        super().__init__()
        self.question = question
        self.yes, self.no = yes, no

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Static(Text(self.question), markup=False)
            with Horizontal():
                yield Button(f"{self.no} (n)", id="no", variant="primary")
                yield Button(f"{self.yes} (y)", id="yes", variant="error")

    def on_mount(self) -> None:
        self.query_one("#no", Button).focus()

    def on_button_pressed(self, event: Button.Pressed) -> None:
        event.stop()
        self.dismiss(event.button.id == "yes")

    def action_answer(self, yes: bool) -> None:
        self.dismiss(bool(yes))
