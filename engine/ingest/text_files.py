"""Read .txt and .md files: detect binary data, decode, split at form feeds.

Decoding order: a UTF-32/UTF-16 byte-order mark selects that codec; then UTF-8 (a UTF-8 BOM is
stripped); then cp1252; then latin-1 (which cannot fail). Falling back past UTF-8 adds the warning
"not UTF-8: decoded as cp1252" (or latin-1).

Binary test (on the first 8 KB; thresholds are common practice, no source): NUL bytes over 1% of the sample,
or control characters (other than TAB, LF, CR, FF) and U+FFFD replacement characters over 10% of the decoded
sample, mean binary data. Fewer NULs are removed with a warning. Invalid bytes after a byte-order mark are
replaced by U+FFFD, with a warning.

Pages: no form feed -> one Page(number=None, locator="whole file"); with form feeds -> one Page per part,
locator "part N" (N from 1, empty parts kept so the numbering matches the file). Text is lightly repaired
(line breaks, control and invisible characters, ligatures; see text_repair) but spacing is kept.
"""

from __future__ import annotations

import codecs

from engine.ingest import UnreadableFile
from engine.ingest.text_repair import repair_text
from engine.types import Page

SAMPLE_BYTES = 8192
MAX_NUL_FRACTION = 0.01
MAX_CONTROL_FRACTION = 0.10
_ALLOWED_CONTROLS = frozenset("\t\n\r\f")

_BOMS: tuple[tuple[bytes, str], ...] = (
    (codecs.BOM_UTF32_LE, "utf-32"),
    (codecs.BOM_UTF32_BE, "utf-32"),
    (codecs.BOM_UTF8, "utf-8-sig"),
    (codecs.BOM_UTF16_LE, "utf-16"),
    (codecs.BOM_UTF16_BE, "utf-16"),
)


def _control_fraction(sample: str) -> float:
    if not sample:
        return 0.0
    bad = sum(
        1
        for ch in sample
        if ((ch < " " or "\x7f" <= ch <= "\x9f") and ch not in _ALLOWED_CONTROLS) or ch == "\ufffd"
    )
    return bad / len(sample)


def decode_text(data: bytes, suffix: str = ".txt") -> tuple[str, list[str]]:
    """Decode ``data`` (see module docstring); returns (text, warnings). Raises UnreadableFile for binary."""
    warnings: list[str] = []
    for bom, codec in _BOMS:
        if data.startswith(bom):
            try:
                text = data.decode(codec)
            except UnicodeDecodeError:
                text = data.decode(codec, errors="replace")
                label = codec.upper().replace("-SIG", "")
                warnings.append(f"some bytes are not valid {label} (replaced by \ufffd)")
            break
    else:
        nul_fraction = data[:SAMPLE_BYTES].count(0) / max(1, len(data[:SAMPLE_BYTES]))
        if nul_fraction > MAX_NUL_FRACTION:
            raise UnreadableFile(f"binary data in a {suffix} file")
        try:
            text = data.decode("utf-8")
        except UnicodeDecodeError:
            try:
                text = data.decode("cp1252")
                warnings.append("not UTF-8: decoded as cp1252")
            except UnicodeDecodeError:
                text = data.decode("latin-1")
                warnings.append("not UTF-8: decoded as latin-1")
    if _control_fraction(text[:SAMPLE_BYTES]) > MAX_CONTROL_FRACTION:
        raise UnreadableFile(f"binary data in a {suffix} file")
    nuls = text.count("\x00")
    if nuls:
        warnings.append(f"removed {nuls} NUL byte{'s' if nuls != 1 else ''} from the text")
    return text, warnings


def read_text_file(data: bytes, suffix: str = ".txt") -> tuple[tuple[Page, ...], list[str]]:
    """Pages and warnings of a .txt/.md file's bytes (see module docstring)."""
    text, warnings = decode_text(data, suffix)
    parts = text.split("\f")
    pages: list[Page] = []
    for n, part in enumerate(parts, start=1):
        repaired = repair_text(part, join_hyphens=False, collapse_spaces=False).text.strip()
        locator = "whole file" if len(parts) == 1 else f"part {n}"
        pages.append(Page(number=None, text=repaired, locator=locator))
    if not any(p.text for p in pages):
        warnings.append("the file contains no text")
    return tuple(pages), warnings
