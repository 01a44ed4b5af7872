"""Flows 6-7: accept / reject / correct / note / undo an answer (saved in the ReviewStore before it shows), and
reopen an earlier question from the history with its decisions.

Oracle: the ReviewStore read back through a second connection to the same database file.
"""

from __future__ import annotations

import sqlite3

from engine.review_store import ReviewStore
from tests.tui.tui_harness import GOVERNING_LAW, ask, demo_copy, run_async, running_app
from tui.answer_list import AnswerList
from tui.history_screen import HistoryScreen
from tui.text_prompt_screen import TextPromptScreen

TERM = "How long is the operating term of the land lease?"


def stored(folder, answer_id: int):
    """The answer as a fresh ReviewStore connection sees it (what is on disk)."""
    with ReviewStore(folder) as other:
        return other.answer(answer_id)


@run_async
async def test_review_actions_are_saved_then_shown(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        await ask(pilot, GOVERNING_LAW)
        answer_list = app.desk.query_one(AnswerList)
        first = answer_list.answers[0]
        assert stored(folder, first.answer_id).decision is None  # recorded with record_question, undecided

        await pilot.press("a")
        await pilot.pause()
        assert stored(folder, first.answer_id).decision == "accepted"
        assert answer_list.answers[0].decision == "accepted"
        assert "✔ accepted" in answer_list.get_option_at_index(0).prompt.plain

        await pilot.press("down", "r")
        await pilot.pause()
        second = answer_list.answers[1]
        assert stored(folder, second.answer_id).decision == "rejected" and second.decision == "rejected"

        await pilot.press("e")
        await pilot.pause()
        assert isinstance(app.screen, TextPromptScreen)
        prompt = app.screen.query_one("#prompt-input")
        assert prompt.value == second.text  # the dialog starts from the extracted text
        prompt.value = "the laws of the State of Minnesota"
        await pilot.press("enter")
        await pilot.pause()
        on_disk = stored(folder, second.answer_id)
        assert (on_disk.decision, on_disk.corrected_text) == ("corrected", "the laws of the State of Minnesota")
        assert "the laws of the State of Minnesota" in answer_list.get_option_at_index(1).prompt.plain

        await pilot.press("n")
        await pilot.pause()
        app.screen.query_one("#prompt-input").value = "check the [court] clause too"
        await pilot.press("enter")
        await pilot.pause()
        assert stored(folder, second.answer_id).note == "check the [court] clause too"
        assert "check the [court] clause too" in answer_list.get_option_at_index(1).prompt.plain

        await pilot.press("e", "escape")  # a cancelled dialog changes nothing
        await pilot.pause()
        assert stored(folder, second.answer_id).decision == "corrected"

        await pilot.press("u")
        await pilot.pause()
        on_disk = stored(folder, second.answer_id)
        assert (on_disk.decision, on_disk.corrected_text, on_disk.note) == (None, None, "check the [court] clause too")
        assert answer_list.answers[1].decision is None


@run_async
async def test_decision_not_shown_when_the_store_fails(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        await ask(pilot, GOVERNING_LAW)

        def broken(*args, **kwargs):
            raise sqlite3.OperationalError("database is locked")

        app.store.set_decision = broken
        await pilot.press("a")
        await pilot.pause()
        answer_list = app.desk.query_one(AnswerList)
        assert answer_list.answers[0].decision is None
        assert "accepted" not in answer_list.get_option_at_index(0).prompt.plain
        assert stored(folder, answer_list.answers[0].answer_id).decision is None


@run_async
async def test_history_reopens_a_question_with_its_decisions(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder) as (app, pilot):
        await ask(pilot, GOVERNING_LAW)
        await pilot.press("a")
        await pilot.pause()
        accepted_id = app.desk.query_one(AnswerList).answers[0].answer_id
        await ask(pilot, TERM)
        assert app.desk.question.question == TERM
        await pilot.press("escape")  # the answers have focus; leave nothing typed
        await pilot.press("h")
        await pilot.pause()
        assert isinstance(app.screen, HistoryScreen)
        questions = [e.question for e in app.screen.entries]
        assert questions == [TERM, GOVERNING_LAW]  # newest first, as ReviewStore.history() returns them
        await pilot.press("down", "enter")
        await pilot.pause()
        assert app.screen is app.desk
        assert app.desk.question.question == GOVERNING_LAW
        answers = app.desk.query_one(AnswerList).answers
        assert answers[0].answer_id == accepted_id and answers[0].decision == "accepted"
        with ReviewStore(folder) as other:
            _, expected = other.load_question(app.desk.question.question_id)
        assert answers == expected
