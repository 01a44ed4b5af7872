"""Regenerate the invented demo contract folder ``demo_docs/`` deterministically.

Scenario (entirely invented; the contract texts are in ``demo_doc_texts.py``): "Brightwater Commons Solar
Cooperative" and its land lease, equipment supply agreement, power purchase agreement, O&M agreement (.docx, with
tables) and a mutual NDA (.txt).

Invariants:
- the same script and library versions produce the same text content (and, with the fixed dates below,
  the same bytes) on every run;
- PDFs use only the core font Helvetica, so every character is latin-1; quotes are straight;
- page breaks are decided by fpdf2's fixed-size layout (plus explicit ``@pagebreak`` markers), so an
  answer's page number is stable and is recorded in tests/data/demo_questions.jsonl.

Body markup (one block per non-empty line): ``= `` title, ``# `` heading, ``~ `` plain left-aligned
line (signature blocks, schedules), ``| a | b |`` table row (docx only; the first row is the header),
``@pagebreak`` new page (PDF only), anything else a justified paragraph.

Usage: ``.venv/bin/python scripts/make_demo_docs.py [--out DIR]`` (default: <repo>/demo_docs).
"""

from __future__ import annotations

import argparse
import sys
import zipfile
from datetime import datetime, timezone
from pathlib import Path

import docx
from fpdf import FPDF
from fpdf.enums import XPos, YPos

sys.path.insert(0, str(Path(__file__).resolve().parent))
from demo_doc_texts import LAND_LEASE_TEXT, NDA_TEXT, OM_TEXT, PPA_TEXT, SUPPLY_TEXT  # noqa: E402

FIXED_DATE = datetime(2025, 1, 1, 0, 0, 0, tzinfo=timezone.utc)
ZIP_DATE = (2025, 1, 1, 0, 0, 0)
AUTHOR = "Excerptor demo generator (invented scenario)"

# Output files, relative to the output folder.
LAND_LEASE = "land_lease.pdf"
PPA = "power_purchase_agreement.pdf"
SUPPLY = "vendors/equipment_supply_agreement.pdf"
OM = "vendors/om_agreement.docx"
NDA = "mutual_nda_larchpoint.txt"


def _blocks(text: str) -> list[tuple[str, str]]:
    """Split body markup into (kind, text) blocks; kinds: title, h, line, row, pagebreak, p."""
    out: list[tuple[str, str]] = []
    for raw in text.strip().splitlines():
        line = raw.rstrip()
        if not line:
            continue
        if any(ch in line for ch in "\u2018\u2019\u201c\u201d\u2013\u2014"):
            raise ValueError(f"use straight quotes and plain hyphens only (got {line[:40]!r})")
        if line.startswith("= "):
            out.append(("title", line[2:]))
        elif line.startswith("# "):
            out.append(("h", line[2:]))
        elif line.startswith("~"):
            out.append(("line", line[1:].strip()))
        elif line.startswith("|"):
            out.append(("row", line))
        elif line == "@pagebreak":
            out.append(("pagebreak", ""))
        else:
            out.append(("p", line))
    return out


class _ContractPDF(FPDF):
    """Letter page, Helvetica 11 pt body, footer 'running title - Page n of N'."""

    def __init__(self, running_title: str) -> None:
        super().__init__(orientation="P", unit="mm", format="Letter")
        self.running_title = running_title
        self.set_margins(25, 22, 25)
        self.set_auto_page_break(auto=True, margin=22)

    def footer(self) -> None:
        self.set_y(-14)
        self.set_font("Helvetica", size=8)
        self.cell(0, 5, f"{self.running_title} - Page {self.page_no()} of {{nb}}", align="C")


def build_pdf(body: str, running_title: str, path: Path) -> None:
    """Write ``body`` (markup above) as a PDF at ``path`` with fixed fonts, sizes and metadata dates."""
    pdf = _ContractPDF(running_title)
    pdf.set_title(running_title)
    pdf.set_author(AUTHOR)
    pdf.set_creator(AUTHOR)
    pdf.set_creation_date(FIXED_DATE)
    pdf.add_page()
    for kind, text in _blocks(body):
        text.encode("latin-1")  # core fonts: latin-1 only (raises UnicodeEncodeError otherwise)
        if kind == "title":
            pdf.set_font("Helvetica", style="B", size=15)
            pdf.multi_cell(0, 8, text, align="C", new_x=XPos.LMARGIN, new_y=YPos.NEXT)
            pdf.ln(4)
        elif kind == "h":
            if pdf.get_y() > pdf.page_break_trigger - 25:  # keep a heading with its first paragraph
                pdf.add_page()
            pdf.ln(2)
            pdf.set_font("Helvetica", style="B", size=11)
            pdf.multi_cell(0, 6, text, align="L", new_x=XPos.LMARGIN, new_y=YPos.NEXT)
            pdf.ln(1)
        elif kind == "pagebreak":
            pdf.add_page()
        elif kind == "line":
            pdf.set_font("Helvetica", size=11)
            pdf.multi_cell(0, 6, text or " ", align="L", new_x=XPos.LMARGIN, new_y=YPos.NEXT)
        elif kind == "p":
            pdf.set_font("Helvetica", size=11)
            pdf.multi_cell(0, 5.6, text, align="J", new_x=XPos.LMARGIN, new_y=YPos.NEXT)
            pdf.ln(2.2)
        else:
            raise ValueError(f"block kind not supported in PDF (got {kind!r})")
    path.parent.mkdir(parents=True, exist_ok=True)
    pdf.output(str(path))


def _normalise_zip(path: Path) -> None:
    """Rewrite a .docx zip with fixed member timestamps and order so its bytes are stable."""
    with zipfile.ZipFile(path) as zin:
        members = [(info.filename, zin.read(info.filename)) for info in zin.infolist()]
    with zipfile.ZipFile(path, "w") as zout:
        for name, data in members:
            info = zipfile.ZipInfo(name, date_time=ZIP_DATE)
            info.compress_type = zipfile.ZIP_DEFLATED
            info.external_attr = 0o644 << 16
            zout.writestr(info, data)


def build_docx(body: str, title: str, path: Path) -> None:
    """Write ``body`` as a .docx with headings, paragraphs and tables (rows of ``| a | b |``)."""
    document = docx.Document()
    props = document.core_properties
    props.author = AUTHOR
    props.last_modified_by = AUTHOR
    props.created = FIXED_DATE.replace(tzinfo=None)
    props.modified = FIXED_DATE.replace(tzinfo=None)
    props.revision = 1
    props.title = title
    rows: list[list[str]] = []

    def flush_table() -> None:
        if not rows:
            return
        table = document.add_table(rows=len(rows), cols=len(rows[0]))
        table.style = "Table Grid"
        for r, cells in enumerate(rows):
            for c, value in enumerate(cells):
                cell = table.cell(r, c)
                cell.text = value
                if r == 0:
                    for run in cell.paragraphs[0].runs:
                        run.bold = True
        rows.clear()

    for kind, text in _blocks(body):
        if kind != "row":
            flush_table()
        if kind == "title":
            document.add_heading(text, level=0)
        elif kind == "h":
            document.add_heading(text, level=1)
        elif kind == "row":
            cells = [c.strip() for c in text.strip().strip("|").split("|")]
            if rows and len(cells) != len(rows[0]):
                raise ValueError(f"table row has {len(cells)} cells, header has {len(rows[0])} (got {text!r})")
            rows.append(cells)
        elif kind in ("p", "line"):
            document.add_paragraph(text)
        else:
            raise ValueError(f"block kind not supported in docx (got {kind!r})")
    flush_table()
    path.parent.mkdir(parents=True, exist_ok=True)
    document.save(str(path))
    _normalise_zip(path)


def build_txt(body: str, path: Path) -> None:
    """Write ``body`` as plain UTF-8 text: one blank line between blocks, headings in capitals as written."""
    parts = []
    for kind, text in _blocks(body):
        if kind in ("row", "pagebreak"):
            raise ValueError(f"block kind not supported in txt (got {kind!r})")
        parts.append(text)
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text("\n\n".join(parts) + "\n", encoding="utf-8", newline="\n")


def write_all(out_dir: Path) -> list[Path]:
    """Generate every demo document under ``out_dir``; returns the written paths in a fixed order."""
    out_dir = Path(out_dir)
    build_pdf(LAND_LEASE_TEXT, "Solar Ground Lease Agreement", out_dir / LAND_LEASE)
    build_pdf(SUPPLY_TEXT, "Equipment Supply Agreement", out_dir / SUPPLY)
    build_pdf(PPA_TEXT, "Power Purchase Agreement", out_dir / PPA)
    build_docx(OM_TEXT, "Operations and Maintenance Services Agreement", out_dir / OM)
    build_txt(NDA_TEXT, out_dir / NDA)
    return [out_dir / rel for rel in (LAND_LEASE, SUPPLY, PPA, OM, NDA)]


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description="Regenerate the invented demo contracts.")
    parser.add_argument("--out", type=Path, default=Path(__file__).resolve().parent.parent / "demo_docs")
    args = parser.parse_args(argv)
    for path in write_all(args.out):
        print(path)
    return 0


if __name__ == "__main__":
    sys.exit(main())
