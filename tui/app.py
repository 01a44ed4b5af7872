"""Excerptor's review app. ``run_app(folder)`` is what ``excerptor FOLDER`` runs.

Injection for tests and tools: ``ExcerptorApp(folder, workspace=Workspace(folder, reader=..., calibration=...))``
or ``workspace_factory=callable(folder) -> Workspace``; the review store can be passed as ``store``.
"""

from __future__ import annotations

from pathlib import Path
from typing import Callable

from textual import work
from textual.app import App
from textual.binding import Binding

from engine.review_store import ReviewStore
from engine.workspace import Workspace
from tui.answer_list import AnswerList
from tui.commands import ExcerptorCommands
from tui.confirm_screen import ConfirmScreen
from tui.desk_screen import DeskScreen
from tui.document_screen import DocumentScreen
from tui.export_screen import ExportScreen
from tui.grid_screen import GridScreen
from tui.help_screen import HelpScreen, binding_rows
from tui.history_screen import HistoryScreen
from tui.palette import THEME, THEME_NAME
from tui.problems_screen import ProblemsScreen
from tui.question_bar import QuestionBar
from tui.terminal_watch import TERMINAL_POLL_SECONDS, terminal_lost, watched_terminal_fd

DEFAULT_CHECKLIST = Path(__file__).resolve().parent.parent / "checklists" / "commercial.checklist"
EXPORT_STEM = "excerptor-answer-log"


class ExcerptorApp(App[int]):
    """Holds the folder's Workspace (index + reader, loaded once) and ReviewStore; the desk is the home screen."""

    BINDINGS = [Binding("f1,question_mark", "help", "Keys")]

    COMMANDS = App.COMMANDS | {ExcerptorCommands}
    TITLE = "Excerptor"

    def __init__(
        self,
        folder: Path | str,
        *,
        workspace: Workspace | None = None,
        workspace_factory: Callable[[Path], Workspace] | None = None,
        store: ReviewStore | None = None,
        checklist: Path | str | None = None,
        export_dir: Path | str | None = None,
    ) -> None:
        super().__init__()
        self.folder = Path(folder).resolve()
        if workspace is not None:
            self.workspace = workspace
        else:
            self.workspace = (workspace_factory or Workspace)(self.folder)
        self.store = store if store is not None else ReviewStore(self.folder)
        self.checklist_path = Path(checklist) if checklist is not None else DEFAULT_CHECKLIST
        self.export_dir = Path(export_dir) if export_dir is not None else default_export_dir(self.folder)
        self.export_format = "csv"
        self.last_export: Path | None = None
        self.desk = DeskScreen()

    def get_default_screen(self) -> DeskScreen:
        return self.desk

    def on_mount(self) -> None:
        self.register_theme(THEME)
        self.theme = THEME_NAME
        self.sub_title = self.folder.name
        terminal_fd = None if self.is_headless else watched_terminal_fd()
        if terminal_fd is not None:
            self.set_interval(TERMINAL_POLL_SECONDS, lambda: self._exit_if_terminal_lost(terminal_fd))

    def _exit_if_terminal_lost(self, fd: int) -> None:
        if terminal_lost(fd):
            self.exit(return_code=1)

    def on_unmount(self) -> None:
        self.store.close()
        self.workspace.close()

    # Actions (the command palette runs these too) ----------------------------------------------------
    def action_help(self) -> None:
        if not isinstance(self.screen, HelpScreen):
            self.push_screen(HelpScreen(help_sections()))

    def action_ask(self) -> None:
        self._to_desk()
        self.desk.action_ask()

    def action_scope(self) -> None:
        self._to_desk()
        self.desk.action_scope()

    def action_clear_scope(self) -> None:
        self._to_desk()
        self.desk.action_clear_scope()

    def action_reindex(self) -> None:
        self._to_desk()
        self.desk.action_reindex()

    def action_history(self) -> None:
        self._to_desk()

        def reopen(question_id: int | None) -> None:
            if question_id is not None:
                entry, answers = self.store.load_question(question_id)
                self.desk.show_question(entry, answers)
                self.desk.query_one(AnswerList).focus()

        self.push_screen(HistoryScreen(self.store), reopen)

    def action_problems(self) -> None:
        report = self.desk.report
        if report is None:
            self.notify("The folder is still being indexed.", markup=False)
            return
        self.push_screen(ProblemsScreen(list(report.failed), list(report.warnings)))

    def action_grid(self) -> None:
        if not self.is_screen_installed("grid"):
            self.install_screen(GridScreen(self.checklist_path), "grid")
        if self.screen is not self.get_screen("grid"):
            self._to_desk()
            self.push_screen("grid")

    def action_export(self) -> None:
        self.export_flow()

    # Workers ---------------------------------------------------------------------------------------
    @work(exclusive=True, group="export")
    async def export_flow(self) -> None:
        """Dialog -> (confirmation when the file exists) -> write in a thread worker."""
        default = self.export_dir / f"{EXPORT_STEM}.{self.export_format}"
        request = await self.push_screen_wait(ExportScreen(default, self.export_format))
        if request is None:
            return
        self.export_format = request.fmt
        overwrite = False
        if request.path.exists():
            overwrite = await self.push_screen_wait(ConfirmScreen(
                f"{request.path} already exists.\nReplace it with the new answer log?", yes="Replace", no="Keep"))
            if not overwrite:
                self.notify("Nothing exported: the existing file was kept.", markup=False)
                return
        self.write_export(request, overwrite)

    @work(thread=True, exclusive=True, group="export-write")
    def write_export(self, request, overwrite: bool) -> None:
        try:
            from engine.export_log import export_log

            rows = self.store.log_rows()
            out = export_log(rows, request.fmt, request.path, overwrite=overwrite)
        except FileExistsError:
            self.call_from_thread(self.notify, f"{request.path} appeared meanwhile; it was not overwritten.",
                                  severity="warning", markup=False)
            return
        except (ImportError, ValueError, OSError) as error:
            self.call_from_thread(self.notify, f"Export failed: {error}", severity="error", markup=False)
            return
        self.last_export = Path(out)
        self.call_from_thread(self.notify, f"Exported {len(rows)} rows to {out}", markup=False)

    # Helpers ---------------------------------------------------------------------------------------
    def _to_desk(self) -> None:
        while self.screen is not self.desk and len(self.screen_stack) > 1:
            self.pop_screen()


def default_export_dir(folder: Path) -> Path:
    """The working folder, unless it is inside the reviewed folder (an export there would be indexed)."""
    here = Path.cwd().resolve()
    return folder.parent if here == folder or folder in here.parents else here


def help_sections() -> list[tuple[str, list[tuple[str, str]]]]:
    """Every key, grouped by where it works (taken from the classes' BINDINGS)."""
    return [
        ("Anywhere", binding_rows(ExcerptorApp.BINDINGS) + [
            ("ctrl+p", "Command palette: search every action"), ("tab,shift+tab", "Move between panes"),
            ("ctrl+q", "Quit")]),
        ("Desk", binding_rows(DeskScreen.BINDINGS)),
        ("Question box", [("enter", "Ask the question")] + binding_rows(QuestionBar.BINDINGS)),
        ("Answers", [("up,down", "Move between answers; the source follows"), ("enter", "Open at page")]
         + binding_rows(AnswerList.BINDINGS)),
        ("Document", binding_rows(DocumentScreen.BINDINGS) + [("up,down,pageup,pagedown", "Scroll the page")]),
        ("Checklist grid", [("up,down,left,right", "Move between cells; the source follows"),
                            ("enter", "Open at page")] + binding_rows(GridScreen.BINDINGS)),
        ("Dialogs", [("enter", "Save / choose"), ("escape", "Cancel"), ("y,n", "Yes / no (confirmations)")]),
    ]


def run_app(folder: Path, checklist: Path | None = None) -> int:
    """Open the review app on ``folder``; returns the exit status."""
    folder = Path(folder)
    if not folder.is_dir():
        raise ValueError(f"not a folder: {folder} (got a path that is not a directory)")
    if checklist is not None and not Path(checklist).is_file():
        raise ValueError(f"checklist file not found (got {checklist})")
    app = ExcerptorApp(folder, checklist=checklist)
    result = app.run()
    return int(result or app.return_code or 0)
