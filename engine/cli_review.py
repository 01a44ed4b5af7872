"""CLI command for the review record: ``export FOLDER --format csv|jsonl|md|xlsx --out PATH [--overwrite]
[--checklist NAME]``.

Export only reads the review record: a folder without one is an error, and nothing is created in it.
Every refusal raises ``ValueError`` (an existing output file included), which ``engine.cli.main`` reports on
stderr with exit code 2.
"""

from __future__ import annotations

from pathlib import Path

from engine.export_log import FORMATS


def add_review_parsers(sub) -> None:
    p = sub.add_parser("export", help="export the answer log of FOLDER (asked questions and sweep cells)")
    p.add_argument("folder")
    p.add_argument("--format", dest="fmt", choices=FORMATS,
                   help="csv | jsonl | md | xlsx (default: from the --out file extension)")
    p.add_argument("--out", required=True, help="file to write (its folder must exist)")
    p.add_argument("--overwrite", action="store_true", help="replace an existing file")
    p.add_argument("--checklist", help="export only the cells of this checklist sweep")
    p.set_defaults(handler=run_export)


def export_format(fmt: str | None, out: Path) -> str:
    """The explicit format, else the one named by the output file's extension."""
    if fmt:
        return fmt
    suffix = out.suffix.lower().lstrip(".")
    if suffix not in FORMATS:
        raise ValueError(f"give --format ({' | '.join(FORMATS)}): the extension of --out does not name one "
                         f"(got {out.name!r})")
    return suffix


def run_export(args) -> int:
    from engine.export_log import export_log
    from engine.review_store import ReviewStore, review_db_path

    folder = Path(args.folder)
    out = Path(args.out)
    fmt = export_format(args.fmt, out)
    if not folder.is_dir():
        raise ValueError(f"not a folder: {folder} (got a path that is not a directory)")
    if not review_db_path(folder).is_file():
        raise ValueError(f"nothing to export: {folder} has no review record yet (got no {review_db_path(folder)})")
    with ReviewStore(folder) as store:
        rows = store.log_rows()
        checklists = store.checklists()
    if args.checklist is not None:
        if args.checklist not in checklists:
            known = ", ".join(checklists) or "none"
            raise ValueError(f"no sweep cells for checklist {args.checklist!r} (stored checklists: {known})")
        rows = [r for r in rows if r["source"] == f"sweep:{args.checklist}"]
    try:
        written = export_log(rows, fmt, out, overwrite=args.overwrite)
    except FileExistsError as error:
        raise ValueError(str(error)) from None
    print(f"wrote {len(rows)} rows to {written} ({fmt})")
    return 0
