"""Flow 8: export the answer log from a dialog; an existing file is replaced only after an explicit yes.

References: Python's csv and json modules and openpyxl read the written files back.
"""

from __future__ import annotations

import csv
import json

from openpyxl import load_workbook

from engine.review_store import LOG_COLUMNS
from tests.tui.tui_harness import GOVERNING_LAW, ask, demo_copy, run_async, running_app, settle
from textual.widgets import Input, RadioSet
from tui.confirm_screen import ConfirmScreen
from tui.export_screen import ExportScreen


async def _open_export(pilot) -> ExportScreen:
    await pilot.press("escape")  # leave the question box: letters are commands again
    await pilot.press("x")
    await pilot.pause()
    assert isinstance(pilot.app.screen, ExportScreen)
    return pilot.app.screen


@run_async
async def test_export_formats_and_overwrite_confirmation(tmp_path):
    folder = demo_copy(tmp_path)
    async with running_app(folder, export_dir=tmp_path) as (app, pilot):
        await ask(pilot, GOVERNING_LAW)
        await pilot.press("a")
        await pilot.pause()
        accepted = app.desk.question

        # CSV at the default path.
        screen = await _open_export(pilot)
        assert screen.query_one("#export-path", Input).value == str(tmp_path / "excerptor-answer-log.csv")
        await pilot.press("enter")
        await settle(pilot)
        out = tmp_path / "excerptor-answer-log.csv"
        with out.open(newline="", encoding="utf-8") as handle:  # reference: Python csv module
            rows = list(csv.DictReader(handle))
        assert tuple(rows[0].keys()) == LOG_COLUMNS
        assert rows[0]["question"] == accepted.question and rows[0]["decision"] == "accepted"
        assert len(rows) == len(app.store.log_rows())

        # JSON Lines: pick the format with the keyboard; the path follows the format.
        screen = await _open_export(pilot)
        screen.query_one(RadioSet).focus()
        await pilot.press("right", "enter")
        await pilot.pause()
        path_box = screen.query_one("#export-path", Input)
        assert path_box.value.endswith(".jsonl")
        path_box.focus()
        await pilot.press("enter")
        await settle(pilot)
        lines = (tmp_path / "excerptor-answer-log.jsonl").read_text(encoding="utf-8").splitlines()
        objects = [json.loads(line) for line in lines]  # reference: Python json module
        assert objects[0]["decision"] == "accepted" and len(objects) == len(rows)

        # The CSV again: it exists, so a confirmation comes first; "n" keeps the old file untouched.
        before = out.read_bytes()
        await pilot.press("down", "r")  # a new decision, so the new log differs
        await pilot.pause()
        screen = await _open_export(pilot)
        screen.query_one("#export-path", Input).value = str(out)
        await pilot.press("enter")
        await pilot.pause()
        assert isinstance(app.screen, ConfirmScreen)
        await pilot.press("n")
        await settle(pilot)
        assert out.read_bytes() == before

        # ... and "y" replaces it with the longer log.
        screen = await _open_export(pilot)
        screen.query_one("#export-path", Input).value = str(out)
        await pilot.press("enter")
        await pilot.pause()
        assert isinstance(app.screen, ConfirmScreen)
        await pilot.press("y")
        await settle(pilot)
        with out.open(newline="", encoding="utf-8") as handle:
            replaced = list(csv.DictReader(handle))
        assert [r["decision"] for r in replaced[:2]] == ["accepted", "rejected"]

        # XLSX.
        screen = await _open_export(pilot)
        screen.query_one("#export-path", Input).value = str(tmp_path / "log.xlsx")
        screen.query_one("#fmt-xlsx").value = True
        await pilot.pause()
        await pilot.press("enter")
        await settle(pilot)
        book = load_workbook(tmp_path / "log.xlsx", read_only=True)  # reference: openpyxl
        assert book.worksheets[0].max_row >= len(app.store.log_rows())
        assert app.last_export == tmp_path / "log.xlsx"
