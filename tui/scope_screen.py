"""Choose where the next question looks: the whole folder, one subfolder or one document."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical
from textual.screen import ModalScreen
from textual.widgets import Input, OptionList, Static
from textual.widgets.option_list import Option

from tui import palette
from tui.state import Scope


class ScopeScreen(ModalScreen[Scope | None]):
    """Type to filter; Down/Up move, Enter picks, Escape keeps the current scope (returns None)."""

    BINDINGS = [
        Binding("escape", "cancel", "Keep scope"),
        Binding("down", "to_list", "Choices", show=False),
    ]

    DEFAULT_CSS = """
    ScopeScreen { align: center middle; }
    ScopeScreen > Vertical {
        width: 80; height: 26; padding: 0 1; border: round $secondary; background: $surface;
    }
    ScopeScreen OptionList { height: 1fr; }
    """

    def __init__(self, documents: list[str], subfolders: list[str], current: Scope) -> None:
        super().__init__()
        self.choices: list[Scope] = [Scope()] + [Scope(subfolder=f) for f in subfolders] + [
            Scope(doc=d) for d in documents]
        self.current = current
        self.shown: list[Scope] = []

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Static(Text("Limit the next questions to…", style="bold"), markup=False)
            yield Input(placeholder="filter by name", id="scope-filter")
            yield OptionList(id="scope-options", markup=False)

    def on_mount(self) -> None:
        self.query_one(Vertical).border_title = "Scope"
        self._fill("")
        self.query_one(Input).focus()

    def on_input_changed(self, event: Input.Changed) -> None:
        self._fill(event.value)

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        options = self.query_one(OptionList)
        if self.shown:
            self.dismiss(self.shown[options.highlighted or 0])

    def on_option_list_option_selected(self, event: OptionList.OptionSelected) -> None:
        event.stop()
        self.dismiss(self.shown[event.option_index])

    def action_cancel(self) -> None:
        self.dismiss(None)

    def action_to_list(self) -> None:
        self.query_one(OptionList).focus()

    def _fill(self, needle: str) -> None:
        needle = needle.strip().casefold()
        self.shown = [s for s in self.choices if s.is_whole or needle in (s.doc or s.subfolder or "").casefold()]
        options = self.query_one(OptionList)
        options.clear_options()
        options.add_options([Option(self._prompt(s)) for s in self.shown])
        if needle and len(self.shown) > 1:
            here = 1  # the best filtered match, not "Whole folder"
        else:
            here = self.shown.index(self.current) if self.current in self.shown else 0
        options.highlighted = here if self.shown else None

    def _prompt(self, scope: Scope) -> Text:
        mark = "● " if scope == self.current else "  "
        if scope.is_whole:
            return Text(mark + "Whole folder", style="bold", end="")
        kind = "subfolder " if scope.subfolder is not None else "document  "
        text = Text(mark, end="")
        text.append(kind, palette.MUTED)
        text.append(scope.subfolder + "/" if scope.subfolder is not None else scope.doc or "", palette.FILE)
        return text
