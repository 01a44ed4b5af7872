"""One flow of the review app with the committed reader (no fake): ask the demo folder a question and check the
cited answer against tests/data/demo_questions.jsonl (dq10: the land lease's governing law, page 5)."""

from __future__ import annotations

import pytest

from tests.shared_data import reader_dir
from tests.tui.tui_harness import GOVERNING_LAW, SIZE, ask, demo_copy, run_async, settle
from tui.answer_list import AnswerList
from tui.app import ExcerptorApp

pytestmark = pytest.mark.real_model


@run_async
async def test_real_reader_answers_in_the_app(tmp_path):
    reader_dir()  # skips (or fails in CI) without the committed reader
    folder = demo_copy(tmp_path)
    app = ExcerptorApp(folder, export_dir=tmp_path)  # the default workspace: loads the committed reader
    async with app.run_test(size=SIZE) as pilot:
        await settle(pilot, rounds=20)
        await ask(pilot, GOVERNING_LAW)
        await settle(pilot, rounds=20)
        answers = app.desk.query_one(AnswerList).answers
        assert answers, "the reader returned no answer"
        top = answers[0]
        assert "Minnesota" in top.text
        assert (top.file, top.page) == ("land_lease.pdf", 5)
