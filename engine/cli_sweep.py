"""CLI command ``sweep FOLDER --checklist FILE [--out PATH [--overwrite]] [--json]``: every checklist question x every document.

Refreshes the index, sweeps (resumable: cells already up to date are skipped), prints a summary or one JSON
object (the ``SweepReport`` fields plus ``cells``), and with ``--out`` writes the sweep's grid by extension
(.csv, .xlsx or .md) through ``engine.export_log.export_log``.
"""

from __future__ import annotations

import dataclasses
import json
import sys
from pathlib import Path

from engine.checklist import Checklist, load_checklist
from engine.sweep import SweepProgress, SweepReport, run_sweep

EXPORT_FORMATS = {".csv": "csv", ".xlsx": "xlsx", ".md": "md"}
CELL_KEYS = ("doc", "label", "question", "answer", "score", "low_confidence", "page", "locator", "start", "end",
             "abstained", "below_threshold")


def add_sweep_parser(sub) -> None:
    p = sub.add_parser("sweep", help="ask every question of a checklist of every document in FOLDER")
    p.add_argument("folder")
    p.add_argument("--checklist", required=True, type=Path, help="a .checklist file (its stem names the sweep)")
    p.add_argument("--out", type=Path, default=None, help="also write the grid: .csv, .xlsx or .md")
    p.add_argument("--overwrite", action="store_true", help="replace an existing --out file")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(handler=run_sweep_command)


def export_format(out: Path, overwrite: bool = False) -> str:
    """The export format named by ``out``'s extension; checked before sweeping so a long sweep cannot end in a
    refusal to write."""
    fmt = EXPORT_FORMATS.get(out.suffix.lower())
    if fmt is None:
        raise ValueError(f"--out must end in {', '.join(EXPORT_FORMATS)} (got {str(out)!r})")
    if not out.parent.is_dir():
        raise ValueError(f"the folder to write --out into does not exist (got {str(out.parent)!r})")
    if out.exists() and not overwrite:
        raise ValueError(f"--out {str(out)!r} already exists (got no --overwrite)")
    return fmt


def format_seconds(seconds: float | None) -> str:
    if seconds is None:
        return "--:--"
    seconds = int(round(seconds))
    hours, rest = divmod(seconds, 3600)
    return f"{hours}:{rest // 60:02d}:{rest % 60:02d}" if hours else f"{rest // 60}:{rest % 60:02d}"


def progress_line(p: SweepProgress) -> str:
    """``[done/total] cells/s, ETA m:ss  current document``."""
    return (f"[{p.done}/{p.total}] {p.cells_per_second:.1f} cells/s, ETA {format_seconds(p.eta_seconds)}  "
            f"{p.current_doc[:50]}")


def cell_json(cell) -> dict:
    """One stored cell in the CLI's JSON schema (keys ``CELL_KEYS``)."""
    return {"doc": cell.doc_path, "label": cell.label, "question": cell.question, "answer": cell.answer,
            "score": None if cell.score is None else round(float(cell.score), 6),
            "low_confidence": cell.low_confidence, "page": cell.page, "locator": cell.locator,
            "start": cell.start, "end": cell.end, "abstained": cell.abstained,
            "below_threshold": cell.below_threshold}


def print_summary(report: SweepReport, checklist: Checklist, cells: list) -> None:
    from engine.cli import quoted_span

    n_docs = len({c.doc_path for c in cells})
    print(f"checklist {report.checklist}: {n_docs} documents x {len(checklist.items)} questions = "
          f"{report.cells_total} cells; swept {report.cells_swept}, up to date {report.cells_skipped}, "
          f"abstained {report.abstained} ({report.seconds:.2f} s, {report.windows_read} reader windows)")
    current = None
    for cell in cells:
        if cell.doc_path != current:
            current = cell.doc_path
            print(f"\n{current}")
        if cell.answer is None:
            print(f"  {cell.label}: (no answer found)")
            continue
        if cell.below_threshold:
            print(f"  {cell.label}: (no answer found; closest span below the answer threshold follows)")
        flag = "  [BELOW THRESHOLD]" if cell.below_threshold else ("  [LOW CONFIDENCE]" if cell.low_confidence else "")
        print(f"  {cell.label}: {quoted_span(cell.answer)}  confidence {cell.score:.2f}{flag}  "
              f"({cell.locator}, characters {cell.start}-{cell.end})")


def run_sweep_command(args) -> int:
    from engine.indexer import refresh_index
    from engine.review_store import ReviewStore
    from engine.workspace import CAUTION, Workspace

    folder = Path(args.folder)
    checklist = load_checklist(args.checklist)
    fmt = export_format(args.out, args.overwrite) if args.out is not None else None
    refresh_index(folder)
    tty = sys.stderr.isatty()

    def show(p: SweepProgress) -> None:
        if tty:
            print(f"\r{progress_line(p):<100}", end="", file=sys.stderr, flush=True)

    workspace = Workspace(folder)
    try:
        report = run_sweep(workspace, checklist, progress=show)
    finally:
        workspace.close()
        if tty:
            print(file=sys.stderr)
    with ReviewStore(folder) as store:
        cells = store.cells(checklist.name)
        rows = [r for r in store.log_rows() if r["source"] == f"sweep:{checklist.name}"] if fmt else []
    if fmt is not None:
        from engine.export_log import export_log

        export_log(rows, fmt, args.out, overwrite=args.overwrite)
    if args.json:
        print(json.dumps({**dataclasses.asdict(report), "cells": [cell_json(c) for c in cells]}))
    else:
        print_summary(report, checklist, cells)
        if fmt is not None:
            print(f"\nwrote {args.out}")
        print(f"\n{CAUTION}")
    return 0
