"""Every question asked in this folder, newest first, with its answers and decisions; Enter reopens one."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical, VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import OptionList, Static
from textual.widgets.option_list import Option

from tui import palette
from tui.spans import confidence_chip, decision_chip, where


class HistoryScreen(ModalScreen[int | None]):
    """Returns the chosen question_id, or None. ``store``: an engine.review_store.ReviewStore."""

    BINDINGS = [Binding("escape,h", "cancel", "Close")]

    DEFAULT_CSS = """
    HistoryScreen { align: center middle; }
    HistoryScreen > Vertical {
        width: 96%; height: 90%; border: round $primary; background: $surface; padding: 0 1;
    }
    HistoryScreen Horizontal { height: 1fr; }
    HistoryScreen #history-list { width: 45%; }
    HistoryScreen VerticalScroll { width: 1fr; border: round $panel; padding: 0 1; }
    """

    def __init__(self, store) -> None:
        super().__init__()
        self.store = store
        self.entries = store.history()

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Static(Text(f"{len(self.entries)} questions asked in this folder · Enter reopens · Escape closes",
                              style=palette.MUTED), markup=False)
            with Horizontal():
                yield OptionList(*[Option(self._prompt(e)) for e in self.entries], id="history-list", markup=False)
                with VerticalScroll():
                    yield Static(id="history-detail", markup=False)

    def on_mount(self) -> None:
        self.query_one(Vertical).border_title = "History"
        options = self.query_one(OptionList)
        options.focus()
        if self.entries:
            options.highlighted = 0
            self._detail(0)
        else:
            self.query_one("#history-detail", Static).update(Text("Nothing asked yet.", style=palette.MUTED))

    def on_option_list_option_highlighted(self, event: OptionList.OptionHighlighted) -> None:
        event.stop()
        self._detail(event.option_index)

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        self.dismiss(self.entries[event.option_index].question_id)

    def action_cancel(self) -> None:
        self.dismiss(None)

    def _detail(self, index: int) -> None:
        entry, answers = self.store.load_question(self.entries[index].question_id)
        text = Text(entry.question, style="bold", end="")
        text.append(f"\n{entry.scope or 'whole folder'}\n\n", palette.MUTED)
        if entry.abstained:
            text.append("The folder did not seem to answer this question.", "italic")
            if answers:
                text.append("\nClosest spans, below the answer threshold:\n", palette.MUTED)
        for a in answers:
            text.append(f"{a.rank:>2} ")
            text.append_text(confidence_chip(a.score, a.low_confidence))
            text.append(" ")
            text.append(a.corrected_text if a.decision == "corrected" and a.corrected_text else a.text, "bold")
            text.append("  ")
            text.append_text(decision_chip(a.decision))
            text.append("\n    ")
            text.append_text(where(a.file, a.locator))
            if a.note:
                text.append("\n    note: ", palette.MUTED)
                text.append(a.note, "italic")
            text.append("\n")
        self.query_one("#history-detail", Static).update(text)

    @staticmethod
    def _prompt(entry) -> Text:
        when = entry.asked_at.replace("T", " ")[:16]
        text = Text(entry.question, end="")
        note = f"{entry.n_answers} answers" if entry.n_answers else "no answer"
        if entry.abstained:
            note = "no answer" + (f" · {entry.n_answers} below threshold" if entry.n_answers else "")
        text.append(f"\n  {when} · {note}", palette.MUTED)
        if entry.scope:
            text.append(" · " + entry.scope, palette.MUTED)
        return text
