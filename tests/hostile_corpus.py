"""A messy data room on disk: damaged, locked, huge, odd and vanishing files next to a few good contracts.

``write_hostile_folder(root)`` writes every case under ``root`` and returns ``{relative path: expected reason
keyword}``. The keyword is a word or phrase that must appear (case-insensitively) in the ONE problem line the
indexer reports for that file; ``GOOD`` ("") marks a file that must be indexed with no problem line. Files in
``INDEXED_DESPITE_PROBLEM`` are indexed AND get one (non-fatal) warning line.

Two cases need the test's help, because a file on disk cannot do it alone:
- ``UNREADABLE``: chmod 000 does not stop root, so ``deny_reads`` also makes the parser's ``open`` raise
  PermissionError for that path (what a non-root reader of a chmod 000 file gets: open(2), EACCES);
- ``VANISHING``: the test deletes it from the progress callback when the indexer reaches it (``delete_on_reach``).

All names and texts are invented.
"""

from __future__ import annotations

import io
import os
import zipfile
from pathlib import Path
from typing import Callable

from fpdf import FPDF
from pypdf import PdfReader, PdfWriter

GOOD = ""

GOOD_CONTRACTS: dict[str, str] = {
    "good/lease_harbour_view.txt": (
        "LEASE AGREEMENT\n\nThe Tenant shall pay a monthly rent of $4,250 on the first day of each month. "
        "Either party may terminate this lease on ninety days written notice to the other party."
    ),
    "good/supply_lumen_parts.txt": (
        "SUPPLY AGREEMENT\n\nThe Supplier warrants the widgets against defects for eighteen months from delivery. "
        "Liability of the Supplier is capped at $750,000 in aggregate."
    ),
    "good/services_quillmark.md": (
        "# Services Agreement\n\nThe Consultant shall deliver the quarterly audit report within fifteen business "
        "days after each quarter ends. Invoices are payable net forty-five days."
    ),
}
# A good contract whose file name has spaces, non-ASCII letters and a newline (all legal on POSIX).
ODD_NAME = "good/Nebenabrede Zürich ünd\nzweite Zeile.txt"
ODD_NAME_TEXT = "The confidentiality obligations of the Recipient survive for seven years after termination."
# The word each good contract is searchable by (a stemmed token shared with nothing else in the folder).
SEARCH_WORDS: dict[str, str] = {
    "good/lease_harbour_view.txt": "tenant",
    "good/supply_lumen_parts.txt": "widgets",
    "good/services_quillmark.md": "audit",
    ODD_NAME: "confidentiality",
    "empty_password.pdf": "escrow",
    "latin1_notice.txt": "arbitration",
    "nul_bytes.txt": "indemnify",
}

LOCKED_PDF = "locked_with_password.pdf"
EMPTY_PASSWORD_PDF = "empty_password.pdf"
TRUNCATED_PDF = "truncated.pdf"
BROKEN_XREF_PDF = "broken_xref.pdf"
ZERO_BYTES = "zero_bytes.pdf"
JUNK_PDF = "junk.pdf"
JUNK_TXT = "junk.txt"
BIG_PDF = "two_thousand_pages.pdf"
BIG_PDF_PAGES = 2000
NO_TEXT_PDF = "scanned_no_text.pdf"
LATIN1_TXT = "latin1_notice.txt"
NUL_TXT = "nul_bytes.txt"
JUNK_DOCX = "junk_zip.docx"
LOOP_A, LOOP_B = "loop_a.txt", "loop_b.txt"
LOOP_DIR = "good/back_to_root"  # a folder link to the root: must not be walked twice
UNREADABLE = "unreadable.txt"
VANISHING = "vanishing.txt"

INDEXED_DESPITE_PROBLEM = frozenset({NO_TEXT_PDF, LATIN1_TXT, NUL_TXT})


def _pdf_bytes(pages: list[str | None], rectangle: bool = False) -> bytes:
    pdf = FPDF()
    pdf.set_font("Helvetica", size=11)  # core font: latin-1 text only (fpdf2 documentation)
    for text in pages:
        pdf.add_page()
        if text:
            pdf.multi_cell(0, 7, text)
        if rectangle:
            pdf.rect(20, 20, 120, 80, style="F")  # a drawing only: no text-showing operator on the page
    return bytes(pdf.output())


def _encrypted_pdf(text: str, user_password: str) -> bytes:
    writer = PdfWriter(clone_from=PdfReader(io.BytesIO(_pdf_bytes([text]))))
    # RC4-128 is built into pypdf; AES would need the optional 'cryptography' package (pypdf documentation,
    # "Encryption and Decryption of PDFs").
    writer.encrypt(user_password=user_password, owner_password="owner-secret", algorithm="RC4-128")
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


def big_pdf_bytes(n_pages: int = BIG_PDF_PAGES) -> bytes:
    """One fpdf2 page added ``n_pages`` times with pypdf (the copies share one content stream)."""
    page = PdfReader(io.BytesIO(_pdf_bytes(["Schedule page. The rent review occurs every year."]))).pages[0]
    writer = PdfWriter()
    for _ in range(n_pages):
        writer.add_page(page)
    out = io.BytesIO()
    writer.write(out)
    return out.getvalue()


def _broken_xref(data: bytes) -> bytes:
    """Overwrite every xref entry's offset with zeros-and-nines garbage (same length, so the trailer stays)."""
    head, sep, tail = data.rpartition(b"\nxref\n")
    lines = tail.split(b"\n")
    for k, line in enumerate(lines):
        if len(line) >= 18 and line[10:11] == b" " and line[:10].isdigit():
            lines[k] = b"9999999999" + line[10:]
    return head + sep + b"\n".join(lines)


def _junk(n: int, seed: int) -> bytes:
    """Deterministic non-text bytes (a linear congruential generator; constants from Numerical Recipes)."""
    x, out = seed, bytearray()
    for _ in range(n):
        x = (1664525 * x + 1013904223) % 2**32
        out.append(x >> 24)
    return bytes(out)


def _write(root: Path, rel: str, data: bytes) -> None:
    path = root / rel
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_bytes(data)


def write_hostile_folder(root: Path) -> dict[str, str]:
    """Write every case under ``root`` (see the module docstring); returns {relative path: reason keyword}."""
    root = Path(root)
    root.mkdir(parents=True, exist_ok=True)
    cases: dict[str, str] = {}
    for rel, text in GOOD_CONTRACTS.items():
        _write(root, rel, text.encode("utf-8"))
        cases[rel] = GOOD
    _write(root, ODD_NAME, ODD_NAME_TEXT.encode("utf-8"))
    cases[ODD_NAME] = GOOD

    _write(root, LOCKED_PDF, _encrypted_pdf("The purchase price is locked away.", "open-sesame"))
    cases[LOCKED_PDF] = "password"
    _write(root, EMPTY_PASSWORD_PDF, _encrypted_pdf("The escrow agent releases the deposit at closing.", ""))
    cases[EMPTY_PASSWORD_PDF] = GOOD

    whole = _pdf_bytes(["The licence fee is payable yearly in advance."] * 3)
    _write(root, TRUNCATED_PDF, whole[: len(whole) // 3])
    cases[TRUNCATED_PDF] = "truncated"
    _write(root, BROKEN_XREF_PDF, _broken_xref(_pdf_bytes(["The guarantor covers the renovation loan."])))
    cases[BROKEN_XREF_PDF] = GOOD  # pypdf (strict=False) rebuilds a broken xref table by scanning the file

    _write(root, ZERO_BYTES, b"")
    cases[ZERO_BYTES] = "empty file"
    _write(root, JUNK_PDF, _junk(4096, 1))
    cases[JUNK_PDF] = "not a valid PDF"
    _write(root, JUNK_TXT, _junk(4096, 2))
    cases[JUNK_TXT] = "binary data"

    _write(root, BIG_PDF, big_pdf_bytes())
    cases[BIG_PDF] = GOOD
    _write(root, NO_TEXT_PDF, _pdf_bytes([None, None], rectangle=True))
    cases[NO_TEXT_PDF] = "no text layer"

    _write(root, LATIN1_TXT, "Any dispute goes to arbitration in Genève; the café terms apply.".encode("latin-1"))
    cases[LATIN1_TXT] = "not UTF-8"
    nul_text = "The Contractor shall indemnify the Owner against all third-party claims. " * 8
    _write(root, NUL_TXT, nul_text[:100].encode() + b"\x00\x00" + nul_text[100:].encode())
    cases[NUL_TXT] = "NUL"

    zipped = io.BytesIO()
    with zipfile.ZipFile(zipped, "w") as zf:
        zf.writestr("junk.bin", _junk(2048, 3))
        zf.writestr("readme.txt", "not a word document")
    _write(root, JUNK_DOCX, zipped.getvalue())
    cases[JUNK_DOCX] = "not a Word document"

    os.symlink(LOOP_B, root / LOOP_A)  # loop_a.txt -> loop_b.txt -> loop_a.txt: open(2) fails with ELOOP
    os.symlink(LOOP_A, root / LOOP_B)
    cases[LOOP_A] = cases[LOOP_B] = "link loop"
    os.symlink(root, root / LOOP_DIR)  # folder loop: walked once, reported never (nothing is wrong with it)

    _write(root, UNREADABLE, b"The option to renew must be exercised in writing.")
    os.chmod(root / UNREADABLE, 0)
    cases[UNREADABLE] = "permission denied"
    _write(root, VANISHING, b"This side letter is withdrawn before indexing reaches it.")
    cases[VANISHING] = "not found"
    return cases


def deny_reads(monkeypatch, root: Path, rel: str = UNREADABLE) -> None:
    """Make the parser's ``open`` raise PermissionError for ``root/rel`` even when running as root."""
    from engine.ingest import parse

    target = os.path.abspath(Path(root) / rel)
    real_open = open

    def guarded_open(file, *args, **kwargs):
        if os.path.abspath(os.fspath(file)) == target:
            raise PermissionError(13, "Permission denied", os.fspath(file))
        return real_open(file, *args, **kwargs)

    monkeypatch.setattr(parse, "open", guarded_open, raising=False)


def delete_on_reach(root: Path, rel: str = VANISHING) -> Callable[[object], None]:
    """A progress callback that deletes ``root/rel`` when the indexer announces it (just before reading it)."""

    def progress(p: object) -> None:
        if getattr(p, "current_file", None) == rel:
            (Path(root) / rel).unlink(missing_ok=True)

    return progress


def hanging_read_pdf(data: bytes, max_pages: int, max_seconds: float):
    """A stand-in PDF reader whose one page never finishes (for the hard time limit test)."""
    import time as _time

    while True:
        _time.sleep(1)
