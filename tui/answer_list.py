"""Ranked answers of one question; review keys act on the highlighted answer.

The list only shows ``StoredAnswer`` records handed to it; every review action is a message to the screen,
which calls the store and hands back the updated record (so a decision appears only once it is saved).
"""

from __future__ import annotations

from rich.text import Text
from textual.binding import Binding
from textual.message import Message
from textual.widgets import OptionList
from textual.widgets.option_list import Option

from tui import palette
from tui.spans import confidence_chip, decision_chip, one_line, snippet, where

NO_ANSWER = "The folder does not seem to answer this question."
NO_ANSWER_HINT = "Try other words, or widen the scope (w)."
BELOW_THRESHOLD_TAG = "below threshold"
WAITING = ("Answers appear here, best match first (passage fit and reader together), each with its confidence "
           "(LOW when the engine doubts it), document and page, and a few words of context. Up/Down move; the "
           "source shows on the right.")


class AnswerList(OptionList):
    """One option per answer: rank, confidence chip, answer text, decision; then file · locator and context."""

    BINDINGS = [
        Binding("o", "jump", "Open", tooltip="Open the document at the cited page"),
        Binding("a", "review('accepted')", "Accept"),
        Binding("r", "review('rejected')", "Reject"),
        Binding("e", "review('corrected')", "Correct", tooltip="Edit the answer text"),
        Binding("n", "review('note')", "Note"),
        Binding("u", "review('clear')", "Undo", tooltip="Clear the decision"),
    ]

    DEFAULT_CSS = """
    AnswerList { height: 1fr; border: round $panel; }
    AnswerList:focus { border: round $primary; }
    AnswerList > .option-list--option { padding: 0 1; }
    """

    class Jump(Message):
        """Open the answer's document at its page."""

        def __init__(self, answer) -> None:
            super().__init__()
            self.answer = answer

    class Review(Message):
        """``kind``: accepted | rejected | corrected | note | clear."""

        def __init__(self, answer, kind: str) -> None:
            super().__init__()
            self.answer = answer
            self.kind = kind

    def __init__(self, **kwargs) -> None:
        super().__init__(markup=False, **kwargs)
        self.answers: list = []
        self.abstained = False

    def on_mount(self) -> None:
        if not self.answers:
            self.add_option(Option(Text(WAITING, style=palette.MUTED), disabled=True))

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        self.action_jump()

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action in ("jump", "review"):
            return self.current is not None
        return True

    def action_jump(self) -> None:
        if self.current is not None:
            self.post_message(self.Jump(self.current))

    def action_review(self, kind: str) -> None:
        if self.current is not None:
            self.post_message(self.Review(self.current, kind))

    @property
    def current(self):
        """The highlighted answer (a StoredAnswer), or None."""
        if self.highlighted is None or not self.answers or self.highlighted >= len(self.answers):
            return None
        return self.answers[self.highlighted]

    def show(self, answers: list, abstained: bool) -> None:
        """Replace the list; the best answer is highlighted. After an abstention ``answers`` are the closest spans
        below the threshold (each tagged so), and they can be reviewed like answers."""
        self.answers = list(answers)
        self.abstained = abstained or not answers
        self.clear_options()
        if self.answers:
            self.add_options([Option(self._prompt(a), id=f"a{a.answer_id}") for a in self.answers])
            self.highlighted = 0
        else:
            text = Text(NO_ANSWER, style="bold", end="")
            text.append("\n" + NO_ANSWER_HINT, palette.MUTED)
            self.add_option(Option(text, disabled=True))
        self.refresh_bindings()

    def replace(self, answer) -> None:
        """Show an updated record (after the store saved it)."""
        for index, old in enumerate(self.answers):
            if old.answer_id == answer.answer_id:
                self.answers[index] = answer
                self.replace_option_prompt_at_index(index, self._prompt(answer))

    @staticmethod
    def _prompt(a) -> Text:
        text = Text(f"{a.rank:>2} ", style="bold", end="")
        text.append_text(confidence_chip(a.score, a.low_confidence))
        text.append("  ")
        if a.decision == "corrected" and a.corrected_text:
            text.append(one_line(a.corrected_text), "bold")
            text.append("  (was: ", palette.MUTED)
            text.append(one_line(a.text), palette.MUTED + " strike")
            text.append(")", palette.MUTED)
        else:
            text.append(one_line(a.text), "bold" if a.decision != "rejected" else palette.MUTED + " strike")
        if a.below_threshold:
            text.append("  ")
            text.append(BELOW_THRESHOLD_TAG, palette.BELOW_THRESHOLD)
        if a.decision:
            text.append("  ")
            text.append_text(decision_chip(a.decision))
        text.append("\n     ")
        text.append_text(where(a.file, a.locator))
        text.append("  ")
        local_start, local_end = a.start - a.passage_start, a.end - a.passage_start
        text.append_text(snippet(a.passage, local_start, local_end))
        if a.note:
            text.append("\n     note: ", palette.MUTED)
            text.append(a.note, "italic")
        return text
