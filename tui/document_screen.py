"""A whole document, one page at a time, opened at a cited span (highlighted) with find-in-document.

Pages come from ``Workspace.pages`` in a thread worker (the workspace lock may be held while the reader loads).
Find matches are case-insensitive literal hits over every page; ``n``/``N`` walk them across pages.
"""

from __future__ import annotations

import re

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import VerticalScroll
from textual.message import Message
from textual.reactive import reactive
from textual.screen import Screen
from textual.widgets import Footer, Input, Static
from textual.worker import get_current_worker

from tui import palette
from tui.spans import clause_bounds, styled, where
from tui.state import SourceSpan


MAX_LINE_WIDGETS = 400  # a longer page (a whole .txt file) is shown in blocks of several lines


class DocumentScreen(Screen[None]):
    """Opened from an answer or a checklist cell; Escape returns to where it was opened, which kept its state."""

    BINDINGS = [
        Binding("escape", "back", "Back", tooltip="Back to the answers or the grid (closes the find box first)"),
        Binding("right_square_bracket", "page(1)", "Next page"),
        Binding("left_square_bracket", "page(-1)", "Previous page"),
        Binding("slash", "find", "Find", tooltip="Find in this document (case-insensitive)"),
        Binding("n", "match(1)", "Next match"),
        Binding("N", "match(-1)", "Previous match"),
        Binding("c", "cited", "Cited span", tooltip="Back to the cited span"),
    ]

    DEFAULT_CSS = """
    DocumentScreen #doc-head { height: auto; padding: 0 1; background: $panel; }
    DocumentScreen #doc-body { height: 1fr; padding: 0 2; border: round $panel; }
    DocumentScreen #doc-body:focus { border: round $primary; }
    DocumentScreen .doc-line { height: auto; }
    DocumentScreen #doc-find { dock: bottom; display: none; }
    DocumentScreen.-finding #doc-find { display: block; }
    """

    page_index: reactive[int] = reactive(-1, init=False, always_update=True)
    match_index: reactive[int | None] = reactive(None, init=False)

    class PagesLoaded(Message):
        def __init__(self, pages: list) -> None:
            super().__init__()
            self.pages = pages

    class PagesFailed(Message):
        def __init__(self, reason: str) -> None:
            super().__init__()
            self.reason = reason

    def __init__(self, workspace, doc: str, target: SourceSpan | None = None) -> None:
        super().__init__()
        self.workspace = workspace
        self.doc = doc
        self.target = target
        self.pages: list = []
        self.matches: list[tuple[int, int, int]] = []  # (page index, start, end)
        self.query_text = ""
        self.focus_on = "cited"  # what the next render scrolls to: "cited" | "match" | "top"
        self.page_text = Text("")  # the current page as shown (tests read the highlight from it)
        self.problem = ""

    def compose(self) -> ComposeResult:
        yield Static(id="doc-head", markup=False)
        yield VerticalScroll(id="doc-body")
        yield Input(placeholder="find in this document (Enter searches, Escape closes)", id="doc-find")
        yield Footer(compact=True)

    def on_mount(self) -> None:
        self._head()
        self.query_one("#doc-body").focus()
        self.load_pages()

    def on_document_screen_pages_loaded(self, message: PagesLoaded) -> None:
        self.pages = message.pages
        if not self.pages:
            self.problem = "This document has no text."
            self._head()
            return
        self.focus_on = "cited"
        self.page_index = self._cited_index() if self.target is not None else 0
        self.refresh_bindings()

    def on_document_screen_pages_failed(self, message: PagesFailed) -> None:
        self.problem = f"Could not open the document: {message.reason}"
        self._head()

    def watch_page_index(self) -> None:
        self._head()
        self.render_page()

    def watch_match_index(self) -> None:
        self._head()
        self.render_page()

    def on_input_submitted(self, event: Input.Submitted) -> None:
        event.stop()
        self.query_text = event.value.strip()
        self.remove_class("-finding")
        self.query_one("#doc-body").focus()
        self.matches = self.find(self.pages, self.query_text)
        if not self.matches:
            self.match_index = None
            self._head()
            self.render_page()
        else:
            here = next((i for i, m in enumerate(self.matches) if m[0] >= self.page_index), 0)
            self._go_match(here)
        self.refresh_bindings()

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if action == "page":
            step = int(parameters[0]) if parameters else 1
            return 0 <= self.page_index + step < len(self.pages)
        if action == "match":
            return bool(self.matches)
        if action == "cited":
            return self.target is not None and bool(self.pages)
        return True

    def action_back(self) -> None:
        if self.has_class("-finding"):
            self.remove_class("-finding")
            self.query_one("#doc-body").focus()
            return
        self.dismiss(None)

    def action_page(self, step: int) -> None:
        new = self.page_index + int(step)
        if 0 <= new < len(self.pages):
            self.focus_on = "top"
            self.page_index = new
            self.refresh_bindings()

    def action_find(self) -> None:
        self.add_class("-finding")
        find = self.query_one("#doc-find", Input)
        find.value = self.query_text
        find.focus()

    def action_match(self, step: int) -> None:
        if self.matches:
            current = -1 if self.match_index is None else self.match_index
            self._go_match((current + int(step)) % len(self.matches))

    def action_cited(self) -> None:
        if self.target is not None and self.pages:
            self.focus_on = "cited"
            self.page_index = self._cited_index()
            self.refresh_bindings()

    @work(thread=True, exclusive=True, group="pages")
    def load_pages(self) -> None:
        worker = get_current_worker()
        try:
            pages = self.workspace.pages(self.doc)
        except (ValueError, FileNotFoundError, OSError) as error:
            self.post_message(self.PagesFailed(str(error)))
            return
        if not worker.is_cancelled:
            self.post_message(self.PagesLoaded(pages))

    @staticmethod
    def find(pages: list, needle: str) -> list[tuple[int, int, int]]:
        """Every case-insensitive literal hit of ``needle``: (page index, start, end) in reading order."""
        if not needle:
            return []
        pattern = re.compile(re.escape(needle), re.IGNORECASE)
        return [(i, m.start(), m.end()) for i, page in enumerate(pages) for m in pattern.finditer(page.text)]

    def _go_match(self, index: int) -> None:
        self.focus_on = "match"
        self.match_index = index
        if self.matches[index][0] != self.page_index:
            self.page_index = self.matches[index][0]
        self.refresh_bindings()

    def _cited_index(self) -> int:
        t = self.target
        for i, page in enumerate(self.pages):
            if (page.number == t.page) if t.page is not None else (page.locator == t.locator):
                return i
        self.problem = f"The cited {t.locator} is no longer in this document."
        return 0

    def _cited_here(self) -> tuple[int, int] | None:
        t = self.target
        if t is None or not self.pages or self._cited_index() != self.page_index:
            return None
        text = self.pages[self.page_index].text
        if not 0 <= t.start <= t.end <= len(text):
            self.problem = "The document changed since this answer was found; the citation is out of range."
            return None
        if text[t.start:t.end] != t.answer:
            self.problem = "The document changed since this answer was found; the highlight may be off."
        return t.start, t.end

    @work(exclusive=True, group="render")
    async def render_page(self) -> None:
        if not 0 <= self.page_index < len(self.pages):
            return
        page = self.pages[self.page_index]
        marks: list[tuple[int, int, str]] = []
        cited = self._cited_here()
        if cited is not None:
            c_start, c_end = clause_bounds(page.text, *cited)
            marks += [(c_start, c_end, palette.CLAUSE), (cited[0], cited[1], palette.SPAN)]
        for i, (p, start, end) in enumerate(self.matches):
            if p == self.page_index:
                marks.append((start, end, palette.MATCH_NOW if i == self.match_index else palette.MATCH))
        self.page_text = styled(page.text, marks)
        lines = self.page_text.split("\n", allow_blank=True) if page.text else [Text("")]
        if not page.has_text_layer and not page.text.strip():
            lines = [Text("(no text on this page: it may be a scanned image)", style=palette.MUTED)]
        per = max(1, -(-len(lines) // MAX_LINE_WIDGETS))  # lines per widget: 1 unless the page is very long
        blocks = [Text("\n", end="").join(lines[i:i + per]) for i in range(0, len(lines), per)]
        body = self.query_one("#doc-body", VerticalScroll)
        await body.remove_children()
        widgets = [Static(block if block.plain else Text(" "), markup=False, classes="doc-line") for block in blocks]
        await body.mount_all(widgets)
        focus = None
        if self.focus_on == "cited" and cited is not None:
            focus = cited[0]
        elif self.focus_on == "match" and self.match_index is not None:
            focus = self.matches[self.match_index][1]
        if focus is None:
            body.scroll_home(animate=False)
        else:
            line = min(page.text.count("\n", 0, focus) // per, len(widgets) - 1)
            self.call_after_refresh(body.scroll_to_widget, widgets[line], center=True, animate=False)
        self._head()

    def _head(self) -> None:
        text = where(self.doc, None)
        if self.pages and 0 <= self.page_index < len(self.pages):
            page = self.pages[self.page_index]
            text.append(f" · {page.locator}", "bold")
            text.append(f" · page {self.page_index + 1} of {len(self.pages)}", palette.MUTED)
        elif not self.problem:
            text.append(" · opening…", palette.MUTED)
        if self.target is not None:
            text.append("\ncited: ", palette.MUTED)
            text.append(" " + self.target.answer + " ", palette.SPAN)
            text.append(f" {self.target.locator}", palette.MUTED)
        if self.query_text:
            text.append(f"\nfind “{self.query_text}”: ", palette.MUTED)
            if self.matches:
                text.append(f"{(self.match_index or 0) + 1} of {len(self.matches)}", "bold")
            else:
                text.append("no match", "bold")
        if self.problem:
            text.append("\n" + self.problem, palette.BAND_STYLE["low"])
        self.query_one("#doc-head", Static).update(text)
