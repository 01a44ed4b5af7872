"""Choose the answer-log format and the file to write. Returns an ExportRequest, or None when cancelled.

Overwriting is not decided here: the caller asks for an explicit confirmation when the file exists.
"""

from __future__ import annotations

from pathlib import Path

from rich.text import Text
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import ModalScreen
from textual.widgets import Button, Input, RadioButton, RadioSet, Static

from tui import palette
from tui.state import ExportRequest

FORMATS = ("csv", "jsonl", "md", "xlsx")
FORMAT_NOTES = {
    "csv": "comma-separated, one row per answer or checklist cell",
    "jsonl": "one JSON object per line",
    "md": "a Markdown table for notes and memos",
    "xlsx": "a spreadsheet workbook",
}


class ExportScreen(ModalScreen[ExportRequest | None]):
    """Tab moves between the formats, the path and the buttons; Enter in the path exports.

    The format and the path's suffix follow each other: picking a format changes a known suffix, typing a
    path with a known suffix picks that format.
    """

    BINDINGS = [Binding("escape", "cancel", "Cancel")]

    DEFAULT_CSS = """
    ExportScreen { align: center middle; }
    ExportScreen > Vertical {
        width: 84; height: auto; padding: 1 2; border: round $primary; background: $surface;
    }
    ExportScreen RadioSet { width: 100%; layout: horizontal; margin-bottom: 1; }
    ExportScreen #export-error { color: $error; height: auto; }
    ExportScreen Horizontal { height: auto; margin-top: 1; }
    ExportScreen Button { margin-right: 2; }
    """

    def __init__(self, default_path: Path, fmt: str = "csv") -> None:
        super().__init__()
        if fmt not in FORMATS:
            raise ValueError(f"format must be one of {', '.join(FORMATS)} (got {fmt!r})")
        self.fmt = fmt
        self.default_path = Path(default_path).with_suffix("." + fmt)

    def compose(self) -> ComposeResult:
        with Vertical():
            yield Static(Text("Export the answer log (asked questions and checklist cells, with decisions)",
                              style="bold"), markup=False)
            with RadioSet(id="export-format"):
                for fmt in FORMATS:
                    yield RadioButton(fmt, value=fmt == self.fmt, id=f"fmt-{fmt}")
            yield Static(id="export-note", markup=False)
            yield Input(value=str(self.default_path), id="export-path")
            yield Static(id="export-error", markup=False)
            with Horizontal():
                yield Button("Export", id="export-go", variant="primary")
                yield Button("Cancel", id="export-cancel")

    def on_mount(self) -> None:
        self.query_one(Vertical).border_title = "Export"
        self._note()
        self.query_one(Input).focus()

    def on_radio_set_changed(self, event: RadioSet.Changed) -> None:
        event.stop()
        self.fmt = FORMATS[event.index]
        path_input = self.query_one("#export-path", Input)
        path = Path(path_input.value.strip() or self.default_path)
        if path.suffix.lstrip(".") in FORMATS or not path.suffix:
            path_input.value = str(path.with_suffix("." + self.fmt))
        self._note()

    def on_input_changed(self, event: Input.Changed) -> None:
        """A path ending in a known format's suffix selects that format."""
        event.stop()
        suffix = Path(event.value.strip()).suffix.lstrip(".").lower()
        if suffix in FORMATS and suffix != self.fmt:
            self.fmt = suffix
            self.query_one(f"#fmt-{suffix}", RadioButton).value = True
            self._note()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self._submit()

    def on_button_pressed(self, event: Button.Pressed) -> None:
        event.stop()
        if event.button.id == "export-go":
            self._submit()
        else:
            self.dismiss(None)

    def action_cancel(self) -> None:
        self.dismiss(None)

    def _note(self) -> None:
        self.query_one("#export-note", Static).update(Text(f"{self.fmt}: {FORMAT_NOTES[self.fmt]}",
                                                           style=palette.MUTED))

    def _submit(self) -> None:
        raw = self.query_one("#export-path", Input).value.strip()
        error = self.query_one("#export-error", Static)
        if not raw:
            error.update(Text("Give a file path."))
            return
        path = Path(raw).expanduser()
        if not path.parent.is_dir():
            error.update(Text(f"No such folder: {path.parent}"))
            return
        if path.is_dir():
            error.update(Text(f"That is a folder, not a file: {path}"))
            return
        self.dismiss(ExportRequest(self.fmt, path))
