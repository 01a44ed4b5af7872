"""The selected answer's source: the clause around it, then the whole passage, answer characters highlighted."""

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
    """Header (file · locator · characters), the clause (answer marked), then the passage (clause tinted)."""

    DEFAULT_CSS = """
    SourcePreview { border: round $panel; padding: 0 1; height: 1fr; }
    SourcePreview > .preview-title { color: $text-muted; text-style: bold; margin-top: 1; }
    """

    span: reactive[SourceSpan | None] = reactive(None)
    clause_text: Text = Text("")  # what the clause block shows (tests read the highlight from it)
    passage_text: Text = Text("")  # what the passage block shows

    def compose(self) -> ComposeResult:
        yield Static(id="preview-head", markup=False)
        yield Static("Clause", classes="preview-title", id="preview-clause-title", markup=False)
        yield Static(id="preview-clause", markup=False)
        yield Static("Passage", classes="preview-title", id="preview-passage-title", markup=False)
        yield Static(id="preview-body", markup=False)

    def on_mount(self) -> None:
        self.border_title = "Source"
        self.watch_span(self.span)

    def watch_span(self, span: SourceSpan | None) -> None:
        if not self.children:  # not composed yet
            return
        for title in self.query(".preview-title"):
            title.display = span is not None
        head = self.query_one("#preview-head", Static)
        if span is None:
            head.update(Text(EMPTY, style=palette.MUTED))
            self.clause_text = self.passage_text = Text("")
        else:
            header = where(span.file, span.locator)
            header.append(f" · characters {span.start}–{span.end}  ", palette.MUTED)
            header.append(" answer ", palette.SPAN)
            header.append(" ")
            header.append(" clause ", palette.CLAUSE)
            head.update(header)
            self.clause_text, self.passage_text = self.render_source(span)
        self.query_one("#preview-clause", Static).update(self.clause_text)
        self.query_one("#preview-body", Static).update(self.passage_text)
        self.scroll_home(animate=False)

    @staticmethod
    def render_source(span: SourceSpan) -> tuple[Text, Text]:
        """(clause with the answer marked, passage with the clause tinted and the answer marked)."""
        n = len(span.passage)
        start, end = (max(0, min(x, n)) for x in span.local)
        c_start, c_end = clause_bounds(span.passage, start, end)
        clause = styled(span.passage[c_start:c_end], [(start - c_start, end - c_start, palette.SPAN)])
        passage = styled(span.passage, [(c_start, c_end, palette.CLAUSE), (start, end, palette.SPAN)])
        return clause, passage
