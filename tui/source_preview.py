"""The selected answer's passage: its clause tinted, the exact answer characters highlighted."""

from __future__ import annotations

from rich.text import Text
from textual.app import ComposeResult
from textual.containers import VerticalScroll
from textual.reactive import reactive
from textual.widgets import Static

from tui import palette
from tui.spans import clause_bounds, styled, where
from tui.state import SourceSpan

EMPTY = "Select an answer to see where it comes from."


class SourcePreview(VerticalScroll, can_focus=False):
    """Header (file · locator · characters), then the passage with the clause and the span marked."""

    DEFAULT_CSS = """
    SourcePreview { border: round $panel; padding: 0 1; height: 1fr; }
    SourcePreview > #preview-head { margin-bottom: 1; }
    """

    span: reactive[SourceSpan | None] = reactive(None)
    passage_text: Text = Text("")  # what the body shows (tests read the highlight from it)

    def compose(self) -> ComposeResult:
        yield Static(id="preview-head", markup=False)
        yield Static(id="preview-body", markup=False)

    def on_mount(self) -> None:
        self.border_title = "Source"
        self.watch_span(self.span)

    def watch_span(self, span: SourceSpan | None) -> None:
        if not self.is_mounted:
            return
        head = self.query_one("#preview-head", Static)
        body = self.query_one("#preview-body", Static)
        if span is None:
            head.update(Text(EMPTY, style=palette.MUTED))
            body.update("")
            self.passage_text = Text("")
            return
        header = where(span.file, span.locator)
        header.append(f" · characters {span.start}–{span.end}", palette.MUTED)
        header.append("\n")
        header.append(" answer ", palette.SPAN)
        header.append(" ")
        header.append(" clause ", palette.CLAUSE)
        head.update(header)
        self.passage_text = self.render_passage(span)
        body.update(self.passage_text)
        self.scroll_home(animate=False)

    @staticmethod
    def render_passage(span: SourceSpan) -> Text:
        start, end = span.local
        start, end = max(0, min(start, len(span.passage))), max(0, min(end, len(span.passage)))
        c_start, c_end = clause_bounds(span.passage, start, end)
        return styled(span.passage, [(c_start, c_end, palette.CLAUSE), (start, end, palette.SPAN)])
