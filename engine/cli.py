"""The ``excerptor`` command. ``excerptor FOLDER`` opens the review app; sub-commands drive the same engine.

Contract (kept stable for other tools):
- ``index FOLDER [--json]``
- ``ask FOLDER "QUESTION" [--top N] [--doc NAME] [--subfolder DIR] [--json]``
- ``ask FOLDER --questions FILE [--json]``  (JSON Lines out, one object per question, with "id" and "seconds")
- ``evaluate DATA.json[.gz] [--limit N] [--json]``
"""

from __future__ import annotations

import argparse
import json
import sys
import time
from pathlib import Path

from engine import defaults
from engine.workspace import CAUTION

COMMANDS = ("index", "ask", "evaluate", "train-reader", "calibrate-reader", "average-readers", "sweep", "export", "open")


def printable(name: str) -> str:
    """A file name on one line: control characters (a newline in a name) are shown escaped, as ``\\n``."""
    return "".join(ch if ch.isprintable() else repr(ch)[1:-1] for ch in name)


def quoted_span(text: str) -> str:
    """An answer on one quoted line: the page's line breaks and runs of spaces shown as single spaces (the
    character offsets printed beside it, and ``--json``, keep the exact text)."""
    return repr(" ".join(text.split()))


def answer_json(result, folder: Path) -> dict:
    """The CLI's JSON schema for one question. ``below_threshold``: after an abstention, the closest spans."""

    def one(a) -> dict:
        return {"text": a.text, "score": round(float(a.score), 6), "file": a.citation.file,
                "page": a.citation.page, "start": a.citation.start, "end": a.citation.end,
                "passage": a.passage, "low_confidence": a.low_confidence, "locator": a.citation.locator}

    return {
        "question": result.question,
        "answers": [one(a) for a in result.answers],
        "abstained": result.abstained,
        "below_threshold": [one(a) for a in result.below_threshold],
    }


BELOW_THRESHOLD_NOTE = ("   Closest spans, below the answer threshold (the reader doubts them; read the source before "
                        "relying on one):")


def print_readable(result) -> None:
    print(f"Q: {result.question}")
    if result.abstained:
        print("   The folder does not seem to answer this question.")
        if result.below_threshold:
            print(BELOW_THRESHOLD_NOTE)
    for rank, a in enumerate(result.shown, 1):
        flag = "  [BELOW THRESHOLD]" if result.abstained else ("  [LOW CONFIDENCE]" if a.low_confidence else "")
        where = f"{printable(a.citation.file)}, {a.citation.locator}"
        print(f"{rank:>2}. {quoted_span(a.text)}  confidence {a.score:.2f}{flag}\n    {where}, characters {a.citation.start}-{a.citation.end}")
    print(f"\n{CAUTION}")


def run_index(args) -> int:
    from engine.indexer import refresh_index

    def show(progress) -> None:
        if not args.json and sys.stderr.isatty():
            print(f"\r[{progress.done}/{progress.total}] {progress.current_file[:60]:<60}", end="", file=sys.stderr)

    report = refresh_index(Path(args.folder), progress=show)
    if args.json:
        print(json.dumps({
            "folder": str(args.folder), "indexed": list(report.indexed), "unchanged": list(report.unchanged),
            "removed": list(report.removed), "seconds": round(report.seconds, 3), "passages": report.n_passages,
            "failed": [{"file": p.path, "reason": p.reason} for p in report.failed],
            "warnings": [{"file": p.path, "reason": p.reason} for p in report.warnings],
        }))
    else:
        if sys.stderr.isatty():
            print(file=sys.stderr)
        print(f"indexed {len(report.indexed)}, unchanged {len(report.unchanged)}, removed {len(report.removed)}, "
              f"failed {len(report.failed)} ({report.n_passages} passages, {report.seconds:.2f} s)")
        for problem in report.failed:
            print(f"  failed: {printable(problem.path)}: {problem.reason}")
        for problem in report.warnings:
            print(f"  warning: {printable(problem.path)}: {problem.reason}")
    return 0


def read_question_file(path: Path) -> list[tuple[str, str]]:
    """One question per line, or JSON Lines with "id" and "question". Returns (id, question) pairs."""
    out = []
    for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
        line = line.strip()
        if not line or line.startswith("#"):
            continue
        if line.startswith("{"):
            try:
                obj = json.loads(line)
                out.append((str(obj.get("id", number)), str(obj["question"])))
            except (json.JSONDecodeError, KeyError) as error:
                raise ValueError(f"{path}: line {number} is not a JSON object with a 'question' (got {error})")
        else:
            out.append((str(number), line))
    return out


def run_ask(args) -> int:
    from engine.indexer import refresh_index
    from engine.workspace import Workspace

    folder = Path(args.folder)
    refresh_index(folder)
    workspace = Workspace(folder)
    workspace.ensure_reader()
    if args.questions:
        for qid, question in read_question_file(Path(args.questions)):
            started = time.perf_counter()
            result = workspace.ask(question, top_n=args.top, doc=args.doc, subfolder=args.subfolder)
            seconds = time.perf_counter() - started
            if args.json:
                print(json.dumps({"id": qid, **answer_json(result, folder), "seconds": round(seconds, 4)}), flush=True)
            else:
                print_readable(result)
        return 0
    if not args.question:
        raise ValueError("ask needs a QUESTION or --questions FILE (got neither)")
    result = workspace.ask(args.question, top_n=args.top, doc=args.doc, subfolder=args.subfolder)
    if args.json:
        print(json.dumps(answer_json(result, folder)))
    else:
        print_readable(result)
    return 0


def run_open(args) -> int:
    from tui.app import run_app

    return run_app(Path(args.folder), Path(args.checklist) if args.checklist else None)


def build_parser() -> argparse.ArgumentParser:
    from engine.cli_train import add_average_parser, add_calibrate_parser, add_evaluate_parser, add_train_parser

    parser = argparse.ArgumentParser(
        prog="excerptor", description="Find and cite answers in a folder of agreements, offline.",
        epilog=CAUTION)
    sub = parser.add_subparsers(dest="command", required=True)
    p = sub.add_parser("open", help="open the review app on FOLDER (same as `excerptor FOLDER`)")
    p.add_argument("folder")
    p.add_argument("--checklist", help="checklist for the grid (default: checklists/commercial.checklist)")
    p.set_defaults(handler=run_open)
    p = sub.add_parser("index", help="index or refresh FOLDER")
    p.add_argument("folder")
    p.add_argument("--json", action="store_true")
    p.set_defaults(handler=run_index)
    p = sub.add_parser("ask", help="ask FOLDER a question")
    p.add_argument("folder")
    p.add_argument("question", nargs="?")
    p.add_argument("--questions", help="file with one question per line, or JSON Lines with id and question")
    p.add_argument("--top", type=int, default=defaults.TOP_N_ANSWERS, help="answers to show")
    p.add_argument("--doc", help="limit to one document (relative path or file name)")
    p.add_argument("--subfolder", help="limit to one subfolder")
    p.add_argument("--json", action="store_true")
    p.set_defaults(handler=run_ask)
    add_evaluate_parser(sub)
    add_train_parser(sub)
    add_calibrate_parser(sub)
    add_average_parser(sub)
    from engine.cli_sweep import add_sweep_parser

    add_sweep_parser(sub)
    from engine.cli_review import add_review_parsers

    add_review_parsers(sub)
    return parser


def main(argv: list[str] | None = None) -> int:
    argv = list(sys.argv[1:] if argv is None else argv)
    if argv and argv[0] not in COMMANDS and not argv[0].startswith("-"):
        argv = ["open", *argv]
    parser = build_parser()
    args = parser.parse_args(argv)
    try:
        return int(args.handler(args) or 0)
    except (ValueError, FileNotFoundError) as error:
        print(f"excerptor: {error}", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        print("excerptor: interrupted", file=sys.stderr)
        return 130


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
