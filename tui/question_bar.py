"""The question line: a text box and, beside it, the scope the next question will use."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal
from textual.message import Message
from textual.reactive import reactive
from textual.widgets import Input, Static

from tui import palette
from tui.state import Scope

PLACEHOLDER = "Type a question about these agreements and press Enter"
# "/" is the key that opens the question box; pressed again inside it, it must not start the question.
NO_LEADING_SLASH = r"(?!/).*"


class QuestionBar(Horizontal):
    """Posts ``QuestionBar.Asked`` with the stripped question when Enter is pressed on a non-empty line."""

    BINDINGS = [Binding("escape", "leave", "To answers")]

    DEFAULT_CSS = """
    QuestionBar { height: 3; }
    QuestionBar > Input { width: 1fr; }
    QuestionBar > #scope-chip { width: auto; max-width: 44; height: 3; content-align: left middle; padding: 0 1; }
    """

    scope: reactive[Scope] = reactive(Scope)

    class Asked(Message):
        def __init__(self, question: str) -> None:
            super().__init__()
            self.question = question

    class Leave(Message):
        """Escape pressed in the question box."""

    def compose(self) -> ComposeResult:
        yield Input(placeholder=PLACEHOLDER, id="question", restrict=NO_LEADING_SLASH)
        yield Static(id="scope-chip", markup=False)

    def on_mount(self) -> None:
        self.watch_scope(self.scope)

    def watch_scope(self, scope: Scope) -> None:
        if not self.children:  # not composed yet
            return
        chip = Text("scope: ", style=palette.MUTED, end="")
        chip.append(scope.label, "bold" if scope.is_whole else "bold #12171D on #9A7BC2")
        self.query_one("#scope-chip", Static).update(chip)

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        question = event.value.strip()
        if question:
            self.post_message(self.Asked(question))

    def action_leave(self) -> None:
        self.post_message(self.Leave())

    @property
    def text(self) -> str:
        return self.query_one(Input).value
