"""Answer-log export: each format read back with an independent reader and compared with ``log_rows()``."""

from __future__ import annotations

import csv
import json
from pathlib import Path

import openpyxl
import pytest

import engine.export_log as export_module
from engine.export_log import CITATION_COLUMNS, FORMATS, export_log, guard_formula, markdown_report, passage_excerpt
from engine.review_store import LOG_COLUMNS, ReviewStore
from engine.types import Answer, AskResult, Citation
from engine.workspace import CAUTION

# OWASP "CSV Injection" page: cells beginning with = + - @ tab or carriage return can start a formula.
FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
PASSAGE = "The tenant pays rent of =1+2 units | per month, due on the first day.\nLate fees apply after ten days."


def _answer(text: str, score: float, file: str, start: int, low: bool = False) -> Answer:
    local = PASSAGE.index(text)
    return Answer(text, score, Citation(file, 1, "p. 1", start, start + len(text)), PASSAGE, start - local,
                  low_confidence=low)


@pytest.fixture()
def rows(tmp_path) -> list[dict]:
    folder = tmp_path / "contracts"
    folder.mkdir()
    with ReviewStore(folder) as store:
        qid = store.record_question(AskResult("What rent | fee is due?", (
            _answer("=1+2 units", 0.876543, "leases/unit-4.txt", 124),
            _answer("ten days", 0.21, "leases/unit-4.txt", 190, low=True)), False))
        store.record_question(AskResult("Who insures the building?", (), True))
        store.record_question(AskResult("Who repairs the roof?", (), True, below_threshold=(
            _answer("ten days", 0.18, "leases/unit-4.txt", 190, low=True),)))
        first, second = store.load_question(qid)[1]
        store.set_decision(first.answer_id, "corrected", corrected_text="-3 units", note="@check | line\nbreak")
        store.set_decision(second.answer_id, "rejected", note="+ wrong clause")
        cell = store.upsert_cell("leases", "leases/unit-4.txt", "sha-1", "Rent", "What rent is due?",
                                 _answer("=1+2 units", 0.5, "leases/unit-4.txt", 124), False)
        store.set_cell_decision(cell.cell_id, "accepted")
        store.upsert_cell("leases", "leases/unit-4.txt", "sha-1", "Insurance", "Who insures?", None, True)
        out = store.log_rows()
    assert len(out) == 6
    return out


def _csv_text(value) -> str:
    """What the CSV should hold for a log value (the module's documented encoding)."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    value = str(value)
    return "'" + value if value.startswith(FORMULA_STARTS) else value


def test_csv_round_trip(rows, tmp_path):
    out = export_log(rows, "csv", tmp_path / "log.csv")
    assert out == tmp_path / "log.csv"
    raw = out.read_bytes()
    assert not raw.startswith(b"\xef\xbb\xbf")  # plain UTF-8, no byte-order mark
    # Python's csv module (RFC 4180 dialect) reads the file back.
    with open(out, newline="", encoding="utf-8") as f:
        reader = csv.reader(f)
        header = next(reader)
        body = list(reader)
    assert header == list(LOG_COLUMNS)
    assert len(body) == len(rows)
    for got, row in zip(body, rows):
        assert got == [_csv_text(row[k]) for k in LOG_COLUMNS]
    assert body[0][LOG_COLUMNS.index("answer")] == "'=1+2 units"
    assert body[0][LOG_COLUMNS.index("corrected_text")] == "'-3 units"
    assert body[0][LOG_COLUMNS.index("note")] == "'@check | line\nbreak"  # newline survives quoting
    assert body[0][LOG_COLUMNS.index("confidence")] == "0.8765"


def test_jsonl_round_trip(rows, tmp_path):
    out = export_log(rows, "jsonl", tmp_path / "log.jsonl")
    lines = out.read_text(encoding="utf-8").splitlines()
    # JSON Lines (jsonlines.org): one JSON value per line, UTF-8. Text is kept exactly (no formula guard).
    assert [json.loads(line) for line in lines] == [{k: row[k] for k in LOG_COLUMNS} for row in rows]


def test_xlsx_round_trip(rows, tmp_path):
    out = export_log(rows, "xlsx", tmp_path / "log.xlsx")
    book = openpyxl.load_workbook(out)  # openpyxl as the independent reader
    assert book.sheetnames == ["Answers", "Citations"]
    sheet = book["Answers"]
    values = list(sheet.iter_rows(values_only=True))
    assert list(values[0]) == list(LOG_COLUMNS)
    assert len(values) == len(rows) + 1
    for got, row in zip(values[1:], rows):
        want = [("'" + v if isinstance(v, str) and v.startswith(FORMULA_STARTS) else v)
                for v in (row[k] for k in LOG_COLUMNS)]
        assert list(got) == want
    assert all(cell.data_type != "f" for line in sheet.iter_rows() for cell in line)  # no formula cells
    assert all(cell.font.bold for cell in sheet[1])
    assert sheet.freeze_panes == "A2"
    assert 8 <= sheet.column_dimensions["B"].width <= 60

    citations = list(book["Citations"].iter_rows(values_only=True))
    assert list(citations[0]) == list(CITATION_COLUMNS)
    swept = [r for r in rows if r["source"] == "sweep:leases" and r["answer"] is not None]
    assert len(citations) == len(swept) + 1 == 2
    checklist, label, file, page, locator, start, end, excerpt = citations[1]
    assert (checklist, label, file, page, locator, start, end) == (
        "leases", "Rent", swept[0]["file"], swept[0]["page"], swept[0]["locator"], swept[0]["start"], swept[0]["end"])
    assert "=1+2 units" in excerpt


def test_markdown_report(rows, tmp_path):
    out = export_log(rows, "md", tmp_path / "log.md")
    text = out.read_text(encoding="utf-8")
    assert text == markdown_report(rows)
    lines = text.splitlines()
    assert lines[0] == "# Excerptor answer log"
    assert text.index(CAUTION) < text.index("## Summary")
    assert "| accepted | 1 |" in lines and "| rejected | 1 |" in lines and "| corrected | 1 |" in lines
    assert "| undecided | 3 |" in lines
    assert "6 rows: 3 answers, 1 closest spans below the answer threshold" in text and "2 low confidence" in text
    assert sum(1 for line in lines if line.startswith("## ") and line[3].isdigit()) == 5  # 3 asked, 2 labels
    # GitHub Flavored Markdown spec, tables extension: a literal pipe inside a cell is written "\|".
    assert "What rent \\| fee is due?" in text
    row = next(line for line in lines if line.startswith("| =1+2 units | 0.88 |"))
    assert "@check \\| line break" in row and "corrected to" in row
    assert any(line.startswith("| ten days | 0.21 (low) |") for line in lines)
    assert any(line.startswith("| ten days | 0.18 (below threshold) |") for line in lines)
    assert text.count("_no answer found_") == 2
    for line in lines:
        if line.startswith("| ") and not line.startswith("| Decision"):
            assert line.replace("\\|", "").count("|") in (3, 7)  # 2 or 6 columns, never broken by a pipe


def test_formula_guard_in_csv_and_xlsx(tmp_path):
    # OWASP "CSV Injection": prefixing such a cell with a single quote makes spreadsheets treat it as text.
    for start in FORMULA_STARTS:
        assert guard_formula(start + "HYPERLINK(1)") == "'" + start + "HYPERLINK(1)"
    assert guard_formula("rent =1") == "rent =1"
    assert guard_formula(-3) == -3 and guard_formula(None) is None
    row = {k: None for k in LOG_COLUMNS} | {"source": "ask", "question": "=cmd|' /C calc'!A0",
                                             "answer": "@SUM(A1)", "start": -1, "low_confidence": False}
    export_log([row], "csv", tmp_path / "g.csv")
    export_log([row], "xlsx", tmp_path / "g.xlsx")
    with open(tmp_path / "g.csv", newline="", encoding="utf-8") as f:
        got = list(csv.DictReader(f))[0]
    assert (got["question"], got["answer"], got["start"]) == ("'=cmd|' /C calc'!A0", "'@SUM(A1)", "-1")
    sheet = openpyxl.load_workbook(tmp_path / "g.xlsx")["Answers"]
    cells = {sheet.cell(1, i + 1).value: sheet.cell(2, i + 1) for i in range(len(LOG_COLUMNS))}
    assert (cells["question"].value, cells["question"].data_type) == ("'=cmd|' /C calc'!A0", "s")
    assert cells["start"].value == -1  # numbers are not text and stay numbers


def _files(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir())


@pytest.mark.parametrize("fmt", FORMATS)
def test_existing_file_is_refused_unless_overwrite(rows, tmp_path, fmt):
    out = tmp_path / f"log.{fmt}"
    out.write_text("keep me", encoding="utf-8")
    with pytest.raises(FileExistsError, match="log"):
        export_log(rows, fmt, out)
    assert out.read_text(encoding="utf-8") == "keep me"
    export_log(rows, fmt, out, overwrite=True)
    assert out.read_bytes() != b"keep me"
    assert [n for n in _files(tmp_path) if n.endswith(".tmp")] == []


def test_bad_arguments(rows, tmp_path):
    with pytest.raises(ValueError, match=r"\(got 'pdf'\)"):
        export_log(rows, "pdf", tmp_path / "log.pdf")
    with pytest.raises(ValueError, match="does not exist"):
        export_log(rows, "csv", tmp_path / "missing" / "log.csv")
    with pytest.raises(ValueError, match="is a folder"):
        export_log(rows, "csv", tmp_path)
    with pytest.raises(ValueError, match="lacks the columns"):
        export_log([{"source": "ask"}], "csv", tmp_path / "log.csv")
    assert not (tmp_path / "missing").exists() and not (tmp_path / "log.csv").exists()


def test_atomic_write_leaves_no_temp_files(rows, tmp_path, monkeypatch):
    out_dir = tmp_path / "out"
    out_dir.mkdir()
    for fmt in FORMATS:
        export_log(rows, fmt, out_dir / f"log.{fmt}")
    assert _files(out_dir) == ["log.csv", "log.jsonl", "log.md", "log.xlsx"]

    def fail_half_way(rows_, path: Path) -> None:
        path.write_text("partial", encoding="utf-8")
        raise OSError("disk full")

    monkeypatch.setattr(export_module, "_write_csv", fail_half_way)
    (out_dir / "log.csv").write_text("previous export", encoding="utf-8")
    with pytest.raises(OSError, match="disk full"):
        export_log(rows, "csv", out_dir / "log.csv", overwrite=True)
    assert (out_dir / "log.csv").read_text(encoding="utf-8") == "previous export"
    with pytest.raises(OSError, match="disk full"):
        export_log(rows, "csv", out_dir / "new.csv")
    assert _files(out_dir) == ["log.csv", "log.jsonl", "log.md", "log.xlsx"]


def test_passage_excerpt():
    # Slicing rule (common practice, no source): the cited span with N characters either side, "..." at cuts.
    row = {"passage": "0123456789ABCDEFGHIJ", "passage_start": 100, "start": 110, "end": 112}
    assert passage_excerpt(row, context=3) == "...789ABCDE..."
    assert passage_excerpt(row, context=50) == "0123456789ABCDEFGHIJ"
    assert passage_excerpt({"passage": None, "passage_start": None, "start": None, "end": None}) == ""
