"""``excerptor export``: writes the log, filters one checklist, refuses to clobber, creates nothing on errors."""

from __future__ import annotations

import csv
import json

import pytest

from engine.cli import main
from engine.review_store import LOG_COLUMNS, ReviewStore
from engine.types import Answer, AskResult, Citation


@pytest.fixture()
def folder(tmp_path):
    folder = tmp_path / "contracts"
    folder.mkdir()
    passage = "This lease renews for one year unless either party objects."
    answer = Answer("one year", 0.7, Citation("lease.txt", None, "whole file", 23, 31), passage, 0)
    with ReviewStore(folder) as store:
        store.record_question(AskResult("How long is the renewal?", (answer,), False))
        store.upsert_cell("renewals", "lease.txt", "sha-1", "Renewal", "How long is the renewal?", answer, False)
        store.upsert_cell("other", "lease.txt", "sha-1", "Renewal", "How long is the renewal?", answer, False)
    return folder


def test_export_all_rows(folder, tmp_path, capsys):
    out = tmp_path / "log.jsonl"
    assert main(["export", str(folder), "--format", "jsonl", "--out", str(out)]) == 0
    printed = capsys.readouterr().out
    assert "wrote 3 rows" in printed and str(out) in printed
    got = [json.loads(line) for line in out.read_text(encoding="utf-8").splitlines()]
    with ReviewStore(folder) as store:
        assert got == [{k: r[k] for k in LOG_COLUMNS} for r in store.log_rows()]


def test_export_one_checklist_with_format_from_extension(folder, tmp_path, capsys):
    out = tmp_path / "renewals.csv"
    assert main(["export", str(folder), "--out", str(out), "--checklist", "renewals"]) == 0
    assert "wrote 1 rows" in capsys.readouterr().out
    with open(out, newline="", encoding="utf-8") as f:  # Python's csv module reads it back
        rows = list(csv.DictReader(f))
    assert [(r["source"], r["label"], r["answer"]) for r in rows] == [("sweep:renewals", "Renewal", "one year")]


def test_existing_file_needs_overwrite(folder, tmp_path, capsys):
    out = tmp_path / "log.md"
    out.write_text("earlier report", encoding="utf-8")
    assert main(["export", str(folder), "--format", "md", "--out", str(out)]) == 2
    err = capsys.readouterr().err
    assert "already exists" in err and str(out) in err
    assert out.read_text(encoding="utf-8") == "earlier report"
    assert main(["export", str(folder), "--format", "md", "--out", str(out), "--overwrite"]) == 0
    assert out.read_text(encoding="utf-8").startswith("# Excerptor answer log")


def test_refusals_exit_2_and_create_nothing(folder, tmp_path, capsys):
    empty = tmp_path / "empty"
    empty.mkdir()
    assert main(["export", str(empty), "--format", "csv", "--out", str(tmp_path / "a.csv")]) == 2
    assert "no review record" in capsys.readouterr().err
    assert list(empty.iterdir()) == []
    assert main(["export", str(folder), "--format", "csv", "--out", str(tmp_path / "a.csv"),
                 "--checklist", "missing"]) == 2
    assert "renewals" in capsys.readouterr().err  # the message lists the stored checklists
    assert main(["export", str(folder), "--out", str(tmp_path / "a.txt")]) == 2
    assert "--format" in capsys.readouterr().err
    assert main(["export", str(folder), "--format", "csv", "--out", str(tmp_path / "no" / "a.csv")]) == 2
    assert "does not exist" in capsys.readouterr().err
    assert not (tmp_path / "a.csv").exists() and not (tmp_path / "a.txt").exists()
