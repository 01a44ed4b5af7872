"""Every key of the app, grouped by where it works. Built from the classes' own BINDINGS, so it cannot drift."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.screen import ModalScreen
from textual.widgets import Static

from tui import palette

KEY_NAMES = {
    "question_mark": "?", "slash": "/", "left_square_bracket": "[", "right_square_bracket": "]",
    "escape": "Esc", "enter": "Enter", "tab": "Tab", "shift+tab": "Shift+Tab", "space": "Space",
    "up": "↑", "down": "↓", "left": "←", "right": "→", "pageup": "PgUp", "pagedown": "PgDn",
    "home": "Home", "end": "End", "f1": "F1",
}


def key_label(keys: str) -> str:
    """'escape,b' -> 'Esc / b'; 'ctrl+r' -> 'Ctrl+R'."""
    out = []
    for key in keys.split(","):
        key = key.strip()
        if key in KEY_NAMES:
            out.append(KEY_NAMES[key])
        elif key.startswith("ctrl+"):
            out.append("Ctrl+" + key[5:].upper())
        elif key.startswith("shift+") and len(key) == 7:
            out.append(key[6].upper())
        else:
            out.append(key)
    return " / ".join(out)


def sections_text(sections: list[tuple[str, list[tuple[str, str]]]]) -> Text:
    """``sections``: (context, [(keys, what)]) -> one aligned block per context."""
    text = Text(end="")
    for title, rows in sections:
        text.append(title + "\n", "bold underline")
        for keys, what in rows:
            text.append(f"  {key_label(keys):<19} ", "bold #D9A441")
            text.append(what + "\n")
        text.append("\n")
    return text


def binding_rows(bindings: list) -> list[tuple[str, str]]:
    rows = []
    for b in bindings:
        if isinstance(b, Binding):
            rows.append((b.key, b.tooltip or b.description or b.action))
        else:
            rows.append((b[0], b[2] if len(b) > 2 else b[1]))
    return rows


class HelpScreen(ModalScreen[None]):
    """Escape, F1 or ? closes it."""

    BINDINGS = [Binding("escape,f1,question_mark", "close", "Close")]

    DEFAULT_CSS = """
    HelpScreen { align: center middle; }
    HelpScreen > VerticalScroll {
        width: 92; height: 90%; padding: 0 2; border: round $accent; background: $surface;
    }
    """

    def __init__(self, sections: list[tuple[str, list[tuple[str, str]]]]) -> None:
        super().__init__()
        self.sections = sections

    def compose(self) -> ComposeResult:
        with VerticalScroll():
            intro = Text("Excerptor keys. The footer shows the keys that work where you are; "
                         "Ctrl+P searches every command.\n\n", style=palette.MUTED)
            intro.append_text(sections_text(self.sections))
            yield Static(intro, markup=False, id="help-text")

    def on_mount(self) -> None:
        self.query_one(VerticalScroll).border_title = "Keys"

    def action_close(self) -> None:
        self.dismiss(None)
