"""Export the answer log (``ReviewStore.log_rows()``) as CSV, JSON Lines, a Markdown report or an XLSX workbook.

Invariants:
- an existing file is never replaced unless ``overwrite=True`` (``FileExistsError`` names the path);
- the file is written to a temp file in the same folder, fsynced, then moved into place in one step
  (``os.replace``, or ``os.link`` when not overwriting, so a file that appears meanwhile is not clobbered);
  nothing else is written, and the temp file is removed on any failure;
- CSV and XLSX guard against spreadsheet formula injection (OWASP "CSV Injection"): a text cell starting with
  ``= + - @``, tab or carriage return gets a leading apostrophe, so a spreadsheet shows it as text and never
  evaluates it. JSON Lines and Markdown keep text exactly as stored.
- CSV, JSON Lines and the XLSX "Answers" sheet hold the columns ``LOG_COLUMNS``, in that order.
"""

from __future__ import annotations

import csv
import json
import os
import secrets
from collections.abc import Callable
from pathlib import Path

from engine.review_store import DECISIONS, LOG_COLUMNS
from engine.workspace import CAUTION

FORMATS = ("csv", "jsonl", "md", "xlsx")
FORMULA_PREFIXES = ("=", "+", "-", "@", "\t", "\r")
XLSX_MAX_CELL_CHARS = 32767  # Excel's limit on the characters in one cell
EXCERPT_CONTEXT_CHARS = 200  # characters of passage kept either side of a cited answer
CITATION_COLUMNS = ("checklist", "label", "file", "page", "locator", "start", "end", "passage excerpt")


def guard_formula(value: object) -> object:
    """``'`` + value for text a spreadsheet would read as a formula; anything else unchanged."""
    if isinstance(value, str) and value.startswith(FORMULA_PREFIXES):
        return "'" + value
    return value


def export_log(rows: list[dict], fmt: str, out: Path, overwrite: bool = False) -> Path:
    """Write ``rows`` to ``out`` in ``fmt`` (csv | jsonl | md | xlsx) atomically. Returns the path written."""
    if fmt not in FORMATS:
        raise ValueError(f"format must be one of {', '.join(FORMATS)} (got {fmt!r})")
    for i, row in enumerate(rows):
        missing = [k for k in LOG_COLUMNS if not isinstance(row, dict) or k not in row]
        if missing:
            raise ValueError(f"row {i} lacks the columns {', '.join(missing)} (got {row!r:.200})")
    out = Path(out)
    if out.is_dir():
        raise ValueError(f"the output path is a folder (got {out})")
    if not out.parent.is_dir():
        raise ValueError(f"the folder to write into does not exist (got {out.parent})")
    if out.exists() and not overwrite:
        raise FileExistsError(f"{out} already exists; choose another path or allow overwriting (--overwrite)")
    writer = {"csv": _write_csv, "jsonl": _write_jsonl, "md": _write_md, "xlsx": _write_xlsx}[fmt]
    _atomic_write(out, overwrite, lambda tmp: writer(rows, tmp))
    return out


# -- atomic write ------------------------------------------------------------------------------------------
def _atomic_write(out: Path, overwrite: bool, write: Callable[[Path], None]) -> None:
    tmp = out.parent / f".{out.name}.{secrets.token_hex(6)}.tmp"
    os.close(os.open(tmp, os.O_CREAT | os.O_EXCL | os.O_WRONLY, 0o666))  # mode follows the umask
    try:
        write(tmp)
        with open(tmp, "rb+") as f:
            os.fsync(f.fileno())
        if overwrite:
            os.replace(tmp, out)
        else:
            try:
                os.link(tmp, out)  # fails if ``out`` appeared since the check
            except FileExistsError:
                raise FileExistsError(f"{out} already exists; choose another path or allow overwriting "
                                      "(--overwrite)") from None
            except OSError:  # a file system without hard links
                if out.exists():
                    raise FileExistsError(f"{out} already exists") from None
                os.replace(tmp, out)
        _fsync_dir(out.parent)
    finally:
        tmp.unlink(missing_ok=True)


def _fsync_dir(folder: Path) -> None:
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


# -- CSV and JSON Lines ------------------------------------------------------------------------------------
def _csv_value(value: object) -> str:
    """None -> "", booleans -> "true"/"false", text guarded against formulas."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    return str(guard_formula(value))


def _write_csv(rows: list[dict], path: Path) -> None:
    with open(path, "w", newline="", encoding="utf-8") as f:
        writer = csv.writer(f)
        writer.writerow(LOG_COLUMNS)
        for row in rows:
            writer.writerow([_csv_value(row[k]) for k in LOG_COLUMNS])


def _write_jsonl(rows: list[dict], path: Path) -> None:
    with open(path, "w", encoding="utf-8", newline="\n") as f:
        for row in rows:
            f.write(json.dumps({k: row[k] for k in LOG_COLUMNS}, ensure_ascii=False) + "\n")


# -- Markdown ----------------------------------------------------------------------------------------------
def _md_cell(value: object) -> str:
    """One table cell: line breaks become spaces, '|' is escaped."""
    text = "" if value is None else str(value)
    return " ".join(text.split()).replace("|", "\\|")


def _group_key(row: dict) -> tuple:
    if row["source"] == "ask":
        return (row["source"], row["question"], row["asked_at"])
    return (row["source"], row["label"], row["question"])


def _decision_text(row: dict) -> str:
    if row["decision"] == "corrected":
        return f"corrected to \u201c{row['corrected_text']}\u201d"
    return row["decision"] or "undecided"


def _where(row: dict) -> str:
    if row["locator"]:
        return str(row["locator"])
    return f"p. {row['page']}" if row["page"] is not None else ""


def markdown_report(rows: list[dict]) -> str:
    """Title, caution, summary (counts by decision, low confidence), then one table per question."""
    counts = {d: sum(1 for r in rows if r["decision"] == d) for d in DECISIONS}
    undecided = sum(1 for r in rows if r["decision"] is None)
    low = sum(1 for r in rows if r["low_confidence"])
    no_answer = sum(1 for r in rows if r["answer"] is None)
    below = sum(1 for r in rows if r["below_threshold"])
    lines = ["# Excerptor answer log", "", f"> {CAUTION}", "", "## Summary", "",
             f"{len(rows)} rows: {len(rows) - no_answer - below} answers, {below} closest spans below the answer "
             f"threshold (the question abstained), {no_answer} with no answer found; {low} low confidence.", "",
             "| Decision | Rows |", "|---|---:|"]
    lines += [f"| {d} | {n} |" for d, n in counts.items()] + [f"| undecided | {undecided} |", ""]
    groups: dict[tuple, list[dict]] = {}
    for row in rows:
        groups.setdefault(_group_key(row), []).append(row)
    for number, group in enumerate(groups.values(), 1):
        first = group[0]
        if first["source"] == "ask":
            lines += [f"## {number}. {_md_cell(first['question'])}", "", f"Asked {first['asked_at']}.", ""]
        else:
            checklist = first["source"].split(":", 1)[1]
            lines += [f"## {number}. {_md_cell(first['label'])} ({_md_cell(checklist)} checklist)", "",
                      f"Question: {_md_cell(first['question'])}", ""]
        lines += ["| Answer | Confidence | File | Page / locator | Decision | Note |", "|---|---:|---|---|---|---|"]
        for r in group:
            answer = "_no answer found_" if r["answer"] is None else r["answer"]
            confidence = "" if r["confidence"] is None else f"{r['confidence']:.2f}"
            if r["below_threshold"]:
                confidence += " (below threshold)"
            elif r["low_confidence"]:
                confidence += " (low)"
            cells = (answer, confidence, r["file"], _where(r), _decision_text(r), r["note"])
            lines.append("| " + " | ".join(_md_cell(c) for c in cells) + " |")
        lines.append("")
    return "\n".join(lines)


def _write_md(rows: list[dict], path: Path) -> None:
    path.write_text(markdown_report(rows), encoding="utf-8")


# -- XLSX --------------------------------------------------------------------------------------------------
def _xlsx_value(value: object) -> object:
    if not isinstance(value, str):
        return value
    from openpyxl.cell.cell import ILLEGAL_CHARACTERS_RE

    value = guard_formula(ILLEGAL_CHARACTERS_RE.sub("\ufffd", value))
    return value[:XLSX_MAX_CELL_CHARS]


def passage_excerpt(row: dict, context: int = EXCERPT_CONTEXT_CHARS) -> str:
    """The cited characters with ``context`` characters of their passage either side ("..." marks cuts)."""
    passage, offset = row.get("passage"), row.get("passage_start")
    if not passage or offset is None or row["start"] is None or row["end"] is None:
        return passage or ""
    lo = max(0, row["start"] - offset - context)
    hi = min(len(passage), row["end"] - offset + context)
    return ("..." if lo > 0 else "") + passage[lo:hi] + ("..." if hi < len(passage) else "")


def _fill_sheet(sheet, header: tuple[str, ...], values: list[list]) -> None:
    from openpyxl.styles import Font
    from openpyxl.utils import get_column_letter

    sheet.append(list(header))
    for cell in sheet[1]:
        cell.font = Font(bold=True)
    for row in values:
        sheet.append([_xlsx_value(v) for v in row])
    sheet.freeze_panes = "A2"
    for i, name in enumerate(header):
        longest = max([len(name)] + [len(str(r[i])) for r in values[:500] if r[i] is not None])
        sheet.column_dimensions[get_column_letter(i + 1)].width = min(max(longest + 2, 8), 60)


def _write_xlsx(rows: list[dict], path: Path) -> None:
    from openpyxl import Workbook

    book = Workbook()
    answers = book.active
    answers.title = "Answers"
    _fill_sheet(answers, LOG_COLUMNS, [[row[k] for k in LOG_COLUMNS] for row in rows])
    swept = [r for r in rows if r["source"].startswith("sweep:") and r["answer"] is not None]
    if swept:
        _fill_sheet(book.create_sheet("Citations"), CITATION_COLUMNS,
                    [[r["source"].split(":", 1)[1], r["label"], r["file"], r["page"], r["locator"], r["start"],
                      r["end"], passage_excerpt(r)] for r in swept])
    book.save(path)
