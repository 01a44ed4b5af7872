"""Flows 1-3 of the review app: open a folder (background indexing), ask, inspect an answer's source.

Oracles: the engine's own records (Workspace.ask / Workspace.pages / IndexReport) for what must be shown, and
pypdf (an independent PDF reader) for the text around a highlighted answer.
"""

from __future__ import annotations

import threading
from dataclasses import replace

from pypdf import PdfReader

from engine.workspace import Workspace
from tests.fakes import FAKE_CALIBRATION, FakeReader
from tests.tui.tui_harness import (DEMO, GOVERNING_LAW, SIZE, ask, build_app, demo_copy, fake_workspace, run_async,
                                   running_app, settle)
from textual.widgets import Input, ProgressBar, Static
from tui import palette
from tui.answer_list import BELOW_THRESHOLD_TAG, NO_ANSWER, AnswerList
from tui.desk_screen import BELOW_THRESHOLD_HEADING, READER_LOADING, READER_READY
from tui.history_screen import HistoryScreen
from tui.index_meter import IndexMeter
from tui.problems_screen import ProblemsScreen
from tui.source_preview import SourcePreview
from tui.spans import text_under


class GatedWorkspace(Workspace):
    """Indexing pauses after the first file until ``gate`` is set, so the test can use the app meanwhile."""

    def __init__(self, folder, gate: threading.Event, **kwargs) -> None:
        super().__init__(folder, **kwargs)
        self.gate = gate
        self.seen: list[tuple[int, int, str]] = []

    def refresh(self, progress=None, should_stop=None):
        def slowed(p) -> None:
            self.seen.append((p.done, p.total, p.current_file))
            if progress is not None:
                progress(p)
            if p.done == 1:
                self.gate.wait(10)

        return super().refresh(progress=slowed, should_stop=should_stop)


def _plain(static: Static) -> str:
    content = static.content
    return content.plain if hasattr(content, "plain") else str(content)


@run_async
async def test_indexing_runs_in_background_with_progress(tmp_path):
    folder = demo_copy(tmp_path)
    gate = threading.Event()
    workspace = GatedWorkspace(folder, gate, reader=FakeReader(), calibration=FAKE_CALIBRATION)
    app = build_app(folder, workspace=workspace)
    async with app.run_test(size=SIZE) as pilot:
        for _ in range(50):
            await pilot.pause(0.02)
            if app.desk.query_one(IndexMeter).done == 1:
                break
        meter = app.desk.query_one(IndexMeter)
        # 5 files in demo_docs (tests/test_demo_docs.py EXPECTED_FILES); the meter shows file 1 of 5.
        assert (meter.done, meter.total) == (1, 5)
        assert meter.current == workspace.seen[-1][2]  # the engine's IndexProgress.current_file
        assert app.desk.query_one(ProgressBar).total == 5
        # The app stays usable: the question box takes keys and the help screen opens while indexing waits.
        await pilot.press(*"rent")
        assert app.desk.query_one(Input).value == "rent"
        await pilot.press("f1")
        await pilot.pause()
        assert type(app.screen).__name__ == "HelpScreen"
        await pilot.press("escape")
        gate.set()
        await settle(pilot)
        summary = _plain(meter.query_one("#meter-label", Static))
        report_docs = len(workspace.documents())
        assert f"Indexed: {report_docs} documents" in summary  # oracle: Workspace.documents() after refresh
        assert workspace.seen[-1] == (5, 5, "")  # refresh_index reports done == total at the end


@run_async
async def test_failed_files_are_listed_with_reasons(tmp_path):
    folder = demo_copy(tmp_path)
    (folder / "damaged.pdf").write_bytes(b"%PDF-1.4\nthis is not a real PDF body\n")
    async with running_app(folder) as (app, pilot):
        report = app.desk.report
        assert [p.path for p in report.failed] == ["damaged.pdf"]  # oracle: the engine's IndexReport
        await pilot.press("escape")  # leave the question box so letter keys act as commands
        await pilot.press("f")
        await pilot.pause()
        assert isinstance(app.screen, ProblemsScreen)
        shown = _plain(app.screen.query_one("#problems-text", Static))
        assert "damaged.pdf" in shown and report.failed[0].reason in shown


@run_async
async def test_ask_shows_ranked_answers_and_their_source(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        await ask(pilot, GOVERNING_LAW, typed=len("land lease?"))
        shown = app.desk.query_one(AnswerList).answers
        # Oracle: the same question asked directly of a second workspace over the same index.
        direct = fake_workspace(folder).ask(GOVERNING_LAW)
        assert [(a.text, a.file, a.page, a.start, a.end) for a in shown] == [
            (x.text, x.citation.file, x.citation.page, x.citation.start, x.citation.end) for x in direct.answers]
        assert [a.low_confidence for a in shown] == [x.low_confidence for x in direct.answers]
        # Low-confidence answers carry a LOW chip in the low band style (palette.BAND_STYLE["low"]).
        answer_list = app.desk.query_one(AnswerList)
        for index, a in enumerate(shown):
            prompt = answer_list.get_option_at_index(index).prompt
            assert (" LOW " in prompt.plain) == a.low_confidence
            assert a.file in prompt.plain and a.locator in prompt.plain
        assert any(a.low_confidence for a in shown) and not all(a.low_confidence for a in shown)

        # Inspect: the preview highlights exactly the cited characters of the page text.
        best = shown[0]
        page = next(p for p in fake_workspace(folder).pages(best.file) if p.number == best.page)
        preview = app.desk.query_one(SourcePreview)
        cited = page.text[best.start:best.end]  # engine/types.py: page.text[start:end] is the answer
        assert text_under(preview.passage_text, palette.SPAN) == [cited]
        assert text_under(preview.clause_text, palette.SPAN) == [cited]
        clause = text_under(preview.passage_text, palette.CLAUSE)
        assert clause and preview.clause_text.plain.startswith(clause[0])
        # Reference: pypdf's own text of the cited page holds the clause (whitespace-insensitive).
        pdf_text = " ".join(PdfReader(DEMO / best.file).pages[best.page - 1].extract_text().split())
        assert " ".join(preview.clause_text.plain.split()) in pdf_text

        # Moving the highlight moves the preview.
        await pilot.press("down")
        second = shown[1]
        assert text_under(preview.passage_text, palette.SPAN) == [second.passage[
            second.start - second.passage_start: second.end - second.passage_start]]


@run_async
async def test_abstention_says_so_plainly(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        await ask(pilot, "Qwzxv plorkt?")
        assert fake_workspace(folder).ask("Qwzxv plorkt?").abstained  # oracle: the engine abstains
        answer_list = app.desk.query_one(AnswerList)
        assert answer_list.answers == [] and answer_list.abstained
        assert NO_ANSWER in answer_list.get_option_at_index(0).prompt.plain
        entry = app.store.history()[0]
        assert entry.question == "Qwzxv plorkt?" and entry.abstained  # recorded even without answers


@run_async
async def test_an_abstention_shows_the_closest_spans_marked_below_the_threshold(tmp_path):
    folder = demo_copy(tmp_path)
    # A calibration that abstains unless the best span beats null by 100: every question abstains, and the
    # closest spans must still be shown, tagged, and open to review.
    strict = replace(FAKE_CALIBRATION, null_margin_threshold=-100.0)
    async with running_app(folder, workspace=Workspace(folder, reader=FakeReader(), calibration=strict)) as (
            app, pilot):
        await ask(pilot, GOVERNING_LAW)
        direct = Workspace(folder, reader=FakeReader(), calibration=strict).ask(GOVERNING_LAW)  # oracle: the engine
        assert direct.abstained and direct.answers == () and direct.below_threshold
        answer_list = app.desk.query_one(AnswerList)
        assert answer_list.abstained
        assert [(a.text, a.file, a.start, a.end) for a in answer_list.answers] == [
            (x.text, x.citation.file, x.citation.start, x.citation.end) for x in direct.below_threshold]
        for index, a in enumerate(answer_list.answers):
            prompt = answer_list.get_option_at_index(index).prompt.plain
            assert a.below_threshold and BELOW_THRESHOLD_TAG in prompt and " LOW " in prompt
        heading = app.desk.query_one("#desk-question", Static).render()
        assert BELOW_THRESHOLD_HEADING in str(heading)
        # Reviewable like an answer: accepting the first one is stored, and the store keeps the flag.
        await pilot.press("a")
        await settle(pilot)
        stored = app.store.answer(answer_list.answers[0].answer_id)
        assert stored.decision == "accepted" and stored.below_threshold
        entry = app.store.history()[0]
        assert entry.abstained and entry.n_answers == len(direct.below_threshold)
        # History says the same: no answer, n spans below the threshold, listed under their own heading.
        await pilot.press("escape", "h")
        await pilot.pause()
        assert isinstance(app.screen, HistoryScreen)
        assert f"no answer · {entry.n_answers} below threshold" in app.screen._prompt(entry).plain
        detail = str(app.screen.query_one("#history-detail", Static).render())
        assert "did not seem to answer" in detail and "Closest spans, below the answer threshold" in detail


@run_async
async def test_reader_loads_once_in_background_with_status(tmp_path):
    folder = demo_copy(tmp_path)
    gate = threading.Event()
    loads: list[int] = []

    def factory():
        loads.append(1)
        gate.wait(10)
        return FakeReader(), FAKE_CALIBRATION

    app = build_app(folder, workspace=Workspace(folder, reader_factory=factory))
    async with app.run_test(size=SIZE) as pilot:
        await pilot.pause(0.1)
        try:
            assert app.desk.reader_state == READER_LOADING
            assert READER_LOADING in _plain(app.desk.query_one("#desk-status", Static))
        finally:
            gate.set()
        await settle(pilot)
        assert app.desk.reader_state == READER_READY
        await ask(pilot, GOVERNING_LAW)
        await ask(pilot, "How long is the operating term of the land lease?")
        assert loads == [1]  # loaded once, reused (Workspace.ensure_reader contract)
        assert len(app.desk.query_one(AnswerList).answers) > 0


@run_async
async def test_slash_in_an_empty_question_box_is_not_typed(tmp_path):
    """A user told "press / to ask" presses it while the box already has focus: no stray "/" in the question."""
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        box = app.desk.query_one(Input)
        box.focus()
        await pilot.press("slash", "slash", "a", "slash", "b")
        assert box.value == "a/b"  # a "/" inside the question is kept
