"""The reviewer's desk: caution, folder status, indexing meter, the question line, answers and their source.

Slow work (indexing, loading the reader, asking, listing scope choices) runs in thread workers that report
back with messages; store calls (fast local SQLite) run on the UI thread, and the screen shows a decision only
from the record the store returns.
"""

from __future__ import annotations

import sqlite3

from rich.text import Text
from textual import work
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Horizontal
from textual.message import Message
from textual.reactive import reactive
from textual.screen import Screen
from textual.widgets import Footer, Input, OptionList, Static
from textual.worker import get_current_worker

from tui import palette
from tui.answer_list import AnswerList
from tui.caution_note import CautionNote
from tui.document_screen import DocumentScreen
from tui.index_meter import IndexMeter
from tui.question_bar import QuestionBar
from tui.scope_screen import ScopeScreen
from tui.source_preview import SourcePreview
from tui.state import Scope, span_of_answer
from tui.text_prompt_screen import TextPromptScreen

READER_LOADING = "loading reader…"
READER_READY = "reader ready"
STORE_ERRORS = (ValueError, sqlite3.Error, OSError)
BELOW_THRESHOLD_HEADING = ("The folder does not seem to answer this question. The closest spans below are under the "
                           "answer threshold: the reader doubts them, so read the source before relying on one.")
TYPED_KEYS = {"ask", "scope", "clear_scope", "history", "export", "grid", "problems"}


class DeskScreen(Screen[None]):
    """The app's home screen. ``self.app`` is a tui.app.ExcerptorApp (workspace, store)."""

    BINDINGS = [
        Binding("slash", "ask", "Ask", tooltip="Put the cursor in the question box"),
        Binding("s", "scope", "Scope", tooltip="Limit the next questions to one document or subfolder"),
        Binding("w", "clear_scope", "Whole folder", tooltip="Clear the scope: ask the whole folder"),
        Binding("h", "history", "History", tooltip="Reopen an earlier question with its decisions"),
        Binding("x", "export", "Export", tooltip="Export the answer log (CSV, JSONL, MD, XLSX)"),
        Binding("g", "grid", "Grid", tooltip="Checklist grid: documents × checklist questions"),
        Binding("f", "problems", "Files", tooltip="Files that could not be read, with the reason"),
        Binding("ctrl+r", "reindex", "Re-index", show=False, tooltip="Re-index: pick up added, changed, removed files"),
    ]

    DEFAULT_CSS = """
    DeskScreen #desk-status { height: 1; padding: 0 1; background: $panel; }
    DeskScreen #desk-question { height: auto; padding: 0 1; color: $text-muted; }
    DeskScreen #desk-body { height: 1fr; }
    DeskScreen AnswerList { width: 52%; }
    DeskScreen SourcePreview { width: 1fr; }
    """

    reader_state: reactive[str] = reactive("")
    busy: reactive[str] = reactive("")
    n_documents: reactive[int | None] = reactive(None)
    scope: reactive[Scope] = reactive(Scope)

    class IndexStep(Message):
        def __init__(self, done: int, total: int, current: str) -> None:
            super().__init__()
            self.done, self.total, self.current = done, total, current

    class IndexDone(Message):
        def __init__(self, report, documents: list[str] | None, error: str = "") -> None:
            super().__init__()
            self.report, self.documents, self.error = report, documents, error

    class ReaderDone(Message):
        def __init__(self, error: str = "") -> None:
            super().__init__()
            self.error = error

    class Answered(Message):
        def __init__(self, result) -> None:
            super().__init__()
            self.result = result

    class AskFailed(Message):
        def __init__(self, reason: str) -> None:
            super().__init__()
            self.reason = reason

    class ScopeChoices(Message):
        def __init__(self, documents: list[str], subfolders: list[str]) -> None:
            super().__init__()
            self.documents, self.subfolders = documents, subfolders

    def __init__(self) -> None:
        super().__init__()
        self.report = None  # the last IndexReport
        self.question = None  # the HistoryEntry shown

    def compose(self) -> ComposeResult:
        yield CautionNote()
        yield Static(id="desk-status", markup=False)
        yield IndexMeter()
        yield QuestionBar()
        yield Static(id="desk-question", markup=False)
        with Horizontal(id="desk-body"):
            yield AnswerList(id="answers")
            yield SourcePreview()
        yield Footer(compact=True)

    def on_mount(self) -> None:
        self.query_one("#desk-question", Static).update(
            Text("No question yet. Press / to ask; Ctrl+P lists every command; ? lists the keys.", style=palette.MUTED))
        self.reader_state = READER_READY if self.app.workspace.reader_loaded else READER_LOADING
        self._status()
        self.query_one(Input).focus()
        self.action_reindex()
        if not self.app.workspace.reader_loaded:
            self.load_reader()

    # Handlers --------------------------------------------------------------------------------------
    def watch_reader_state(self) -> None:
        self._status()

    def watch_busy(self) -> None:
        self._status()

    def watch_n_documents(self) -> None:
        self._status()

    def watch_scope(self, scope: Scope) -> None:
        if self.children:
            self.query_one(QuestionBar).scope = scope
            self.refresh_bindings()

    def on_desk_screen_index_step(self, message: IndexStep) -> None:
        self.query_one(IndexMeter).progress(message.done, message.total, message.current)

    def on_desk_screen_index_done(self, message: IndexDone) -> None:
        meter = self.query_one(IndexMeter)
        if message.error:
            meter.finish(Text(f"Indexing stopped: {message.error}", style=palette.BAND_STYLE["low"]))
            return
        self.report = message.report
        self.n_documents = len(message.documents or [])
        meter.finish(self._summary(message.report, self.n_documents))

    def on_desk_screen_reader_done(self, message: ReaderDone) -> None:
        self.reader_state = f"reader failed: {message.error}" if message.error else READER_READY

    def on_question_bar_asked(self, message: QuestionBar.Asked) -> None:
        self.busy = "loading reader…" if not self.app.workspace.reader_loaded else "reading…"
        self.ask(message.question, self.scope)

    def on_question_bar_leave(self, message: QuestionBar.Leave) -> None:
        self.query_one(AnswerList).focus()

    def on_desk_screen_answered(self, message: Answered) -> None:
        self.busy = ""
        if self.reader_state != READER_READY and self.app.workspace.reader_loaded:
            self.reader_state = READER_READY
        try:
            qid = self.app.store.record_question(message.result)
            entry, answers = self.app.store.load_question(qid)
        except STORE_ERRORS as error:
            self.notify(f"Could not save the question: {error}", severity="error", markup=False)
            return
        self.show_question(entry, answers)
        self.query_one(AnswerList).focus()

    def on_desk_screen_ask_failed(self, message: AskFailed) -> None:
        self.busy = ""
        self.notify(message.reason, title="Not asked", severity="warning", markup=False)

    def on_desk_screen_scope_choices(self, message: ScopeChoices) -> None:
        def chosen(scope: Scope | None) -> None:
            if scope is not None:
                self.scope = scope
        self.app.push_screen(ScopeScreen(message.documents, message.subfolders, self.scope), chosen)

    def on_option_list_option_highlighted(self, event: OptionList.OptionHighlighted) -> None:
        if event.option_list.id == "answers":
            self._preview()

    def on_answer_list_jump(self, message: AnswerList.Jump) -> None:
        a = message.answer
        self.app.push_screen(DocumentScreen(self.app.workspace, a.file, span_of_answer(a)))

    def on_answer_list_review(self, message: AnswerList.Review) -> None:
        a, kind, store = message.answer, message.kind, self.app.store
        if kind in ("accepted", "rejected"):
            self._save(lambda: store.set_decision(a.answer_id, kind))
        elif kind == "clear":
            self._save(lambda: store.set_decision(a.answer_id, None))
        elif kind == "corrected":
            def corrected(text: str | None) -> None:
                if text is not None and text.strip():
                    self._save(lambda: store.set_decision(a.answer_id, "corrected", corrected_text=text.strip()))
            self.app.push_screen(TextPromptScreen("Correct the answer", f"{a.file} · {a.locator}",
                                                  a.corrected_text or a.text), corrected)
        elif kind == "note":
            def noted(text: str | None) -> None:
                if text is not None:
                    self._save(lambda: store.set_note(a.answer_id, text))
            self.app.push_screen(TextPromptScreen("Note on this answer", a.text, a.note or "",
                                                  "Enter saves (an empty note clears it) · Escape cancels"), noted)

    def check_action(self, action: str, parameters: tuple[object, ...]) -> bool | None:
        if isinstance(self.focused, Input) and action in TYPED_KEYS:
            return False  # while typing, these keys are letters of the question
        if action == "clear_scope":
            return not self.scope.is_whole
        if action == "problems":
            return self.report is not None and bool(self.report.failed or self.report.warnings)
        return True

    # Actions ---------------------------------------------------------------------------------------
    def action_ask(self) -> None:
        self.query_one(Input).focus()

    def action_scope(self) -> None:
        self.scope_choices()

    def action_clear_scope(self) -> None:
        self.scope = Scope()

    def action_history(self) -> None:
        self.app.action_history()

    def action_export(self) -> None:
        self.app.action_export()

    def action_grid(self) -> None:
        self.app.action_grid()

    def action_problems(self) -> None:
        self.app.action_problems()

    def action_reindex(self) -> None:
        self.query_one(IndexMeter).start()
        self.index_folder()

    # Workers ---------------------------------------------------------------------------------------
    @work(thread=True, exclusive=True, group="index")
    def index_folder(self) -> None:
        worker = get_current_worker()
        workspace = self.app.workspace

        def progress(p) -> None:
            if not worker.is_cancelled:
                self.post_message(self.IndexStep(p.done, p.total, p.current_file))

        try:
            report = workspace.refresh(progress=progress, should_stop=lambda: worker.is_cancelled)
            documents = workspace.documents() if not worker.is_cancelled else None
        except Exception as error:  # noqa: BLE001 - any failure is shown, never raised into the UI loop
            self.post_message(self.IndexDone(None, None, f"{type(error).__name__}: {error}"))
            return
        if not worker.is_cancelled:
            self.post_message(self.IndexDone(report, documents))

    @work(thread=True, exclusive=True, group="reader")
    def load_reader(self) -> None:
        try:
            self.app.workspace.ensure_reader()
        except Exception as error:  # noqa: BLE001
            self.post_message(self.ReaderDone(f"{type(error).__name__}: {error}"))
            return
        self.post_message(self.ReaderDone())

    @work(thread=True, exclusive=True, group="ask")
    def ask(self, question: str, scope: Scope) -> None:
        worker = get_current_worker()
        try:
            result = self.app.workspace.ask(question, doc=scope.doc, subfolder=scope.subfolder)
        except FileNotFoundError:
            self.post_message(self.AskFailed("The folder is still being indexed; ask again in a moment."))
            return
        except Exception as error:  # noqa: BLE001
            self.post_message(self.AskFailed(f"{error}"))
            return
        if not worker.is_cancelled:
            self.post_message(self.Answered(result))

    @work(thread=True, exclusive=True, group="scope")
    def scope_choices(self) -> None:
        try:
            documents, subfolders = self.app.workspace.documents(), self.app.workspace.subfolders()
        except Exception as error:  # noqa: BLE001
            self.post_message(self.AskFailed(f"No documents to choose from yet ({error})."))
            return
        if not get_current_worker().is_cancelled:
            self.post_message(self.ScopeChoices(documents, subfolders))

    # Helpers ---------------------------------------------------------------------------------------
    def show_question(self, entry, answers: list) -> None:
        """Show a stored question (fresh or reopened from history) with its stored answers."""
        self.question = entry
        heading = Text("Answers to: ", style=palette.MUTED, end="")
        heading.append(entry.question, "bold")
        heading.append(f"   ({entry.scope or 'whole folder'})", palette.MUTED)
        if entry.abstained and answers:
            heading.append("\n" + BELOW_THRESHOLD_HEADING, palette.BELOW_THRESHOLD)
        self.query_one("#desk-question", Static).update(heading)
        answer_list = self.query_one(AnswerList)
        answer_list.show(answers, entry.abstained)
        self._preview()

    def _save(self, call) -> None:
        try:
            updated = call()
        except STORE_ERRORS as error:
            self.notify(f"Not saved: {error}", severity="error", markup=False)
            return
        self.query_one(AnswerList).replace(updated)
        self._preview()

    def _preview(self) -> None:
        current = self.query_one(AnswerList).current
        self.query_one(SourcePreview).span = span_of_answer(current) if current is not None else None

    def _status(self) -> None:
        if not self.children:  # not composed yet
            return
        text = Text("Folder ", style=palette.MUTED, end="")
        text.append(self.app.folder.name, "bold")
        if self.n_documents is not None:
            text.append(f" · {self.n_documents} documents", palette.MUTED)
        ready = self.reader_state == READER_READY
        text.append(" · ")
        text.append(self.reader_state, palette.MUTED if ready else palette.BAND_STYLE["low"])
        if self.busy:
            text.append(" · ")
            text.append(self.busy, "bold " + palette.FILE)
        self.query_one("#desk-status", Static).update(text)

    @staticmethod
    def _summary(report, n_documents: int) -> Text:
        text = Text(f"Indexed: {n_documents} documents, {report.n_passages} passages", style=palette.MUTED, end="")
        if report.failed:
            text.append(f" · {len(report.failed)} could not be read (f)", palette.BAND_STYLE["low"])
        if report.warnings:
            text.append(f" · {len(report.warnings)} read in part (f)", palette.MUTED)
        return text
