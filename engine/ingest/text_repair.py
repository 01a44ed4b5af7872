"""Repair text-layer artefacts while keeping an exact map back to the raw text.

``repair_text(raw)`` returns ``RepairedText(text, to_raw)`` with ``len(to_raw) == len(text) + 1``:
``to_raw[i]`` is the raw index of the character that produced ``text[i]``, and ``to_raw[len(text)] ==
len(raw)``. ``to_raw`` never decreases. A character expanded from one raw character (the ligature U+FB01
becomes "fi") maps both output characters to that one raw index.

Repairs, in order (each is a regex substitution whose output characters are mapped to the raw text):
1. CR LF and lone CR become LF; form feed, vertical tab, U+2028 and U+2029 become LF.
2. Ligatures U+FB00..U+FB06 become their letters; Unicode spaces (NBSP, U+2000..U+200A, ...) and tabs become
   one plain space; zero-width and other invisible format characters, NUL and C0/C1 control characters go.
3. (``join_hyphens``) a word broken across lines is rejoined: "termi-\\nnation" -> "termination" (only when
   the next line starts with a lower-case letter); a soft hyphen (U+00AD) at a line end is rejoined
   likewise, and any other soft hyphen is removed.
4. (``collapse_spaces``) runs of spaces become one space, spaces next to a line break go, three or more
   line breaks become one blank line (two LF), and the text is stripped. Single line breaks are KEPT.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Callable

# Ligature code points and their decompositions: Unicode standard, Alphabetic Presentation Forms block
# (U+FB00..U+FB4F), compatibility decompositions in UnicodeData.txt.
LIGATURES: dict[str, str] = {
    "\ufb00": "ff",
    "\ufb01": "fi",
    "\ufb02": "fl",
    "\ufb03": "ffi",
    "\ufb04": "ffl",
    "\ufb05": "st",  # long s + t
    "\ufb06": "st",
}

# Unicode space separators (general category Zs) other than U+0020, plus tab.
_SPACES = "\t\u00a0\u1680\u2000\u2001\u2002\u2003\u2004\u2005\u2006\u2007\u2008\u2009\u200a\u202f\u205f\u3000"
# Invisible format characters that only get in the way of search: zero-width space/joiners, word joiner,
# BOM / zero-width no-break space, and the bidi marks LRM/RLM.
_INVISIBLE = "\u200b\u200c\u200d\u200e\u200f\u2060\ufeff"
# C0 controls except TAB (x09), LF (x0A), VT (x0B), FF (x0C), CR (x0D); DEL; C1 controls.
_CONTROLS = "\x00-\x08\x0e-\x1f\x7f-\x9f"
_LINE_BREAKS = "\x0b\x0c\u2028\u2029"

_NEWLINES_RE = re.compile(r"\r\n?|[" + _LINE_BREAKS + "]")
_CHARS_RE = re.compile("[" + "".join(LIGATURES) + _SPACES + _INVISIBLE + _CONTROLS + "]")
_SOFT_HYPHEN_BREAK_RE = re.compile(r"(?<=[^\W\d_])\u00ad[ \t]*\n[ \t]*(?=[^\W\d_])")
_HYPHEN_BREAK_RE = re.compile(r"(?<=[^\W\d_])-[ \t]*\n[ \t]*(?=[a-z])")
_SOFT_HYPHEN_RE = re.compile("\u00ad")
_SPACE_RUN_RE = re.compile(r" {2,}")
_SPACES_AT_BREAK_RE = re.compile(r" *\n *")
_MANY_BREAKS_RE = re.compile(r"\n{3,}")
_EDGES_RE = re.compile(r"^\s+|\s+$")


@dataclass(frozen=True)
class RepairedText:
    """Repaired text and, for each of its characters (plus one end slot), the index into the raw text."""

    text: str
    to_raw: tuple[int, ...]


def _char_replacement(match: re.Match[str]) -> str:
    ch = match.group(0)
    if ch in LIGATURES:
        return LIGATURES[ch]
    if ch in _SPACES:
        return " "
    return ""


def _sub(
    text: str, index: list[int], pattern: re.Pattern[str], repl: str | Callable[[re.Match[str]], str]
) -> tuple[str, list[int]]:
    """Apply ``pattern.sub(repl)`` to ``text`` and carry the per-character ``index`` along.

    A replacement character that also occurs in the matched text maps to that occurrence (so " \\n " ->
    "\\n" maps to the raw LF); otherwise it maps to the first matched character.
    """
    out_parts: list[str] = []
    out_index: list[int] = []
    last = 0
    for match in pattern.finditer(text):
        a, b = match.span()
        out_parts.append(text[last:a])
        out_index.extend(index[last:a])
        new = repl(match) if callable(repl) else repl
        matched = match.group(0)
        pos = matched.find(new) if len(new) == 1 else -1
        out_index.extend([index[a + pos] if pos >= 0 else index[a]] * len(new))
        out_parts.append(new)
        last = b
    if last == 0 and not out_parts:
        return text, index
    out_parts.append(text[last:])
    out_index.extend(index[last:])
    return "".join(out_parts), out_index


def repair_text(raw: str, *, join_hyphens: bool = True, collapse_spaces: bool = True) -> RepairedText:
    """Repair ``raw`` (see the module docstring); ``raw[to_raw[i]]`` is where ``text[i]`` came from."""
    if not isinstance(raw, str):
        raise ValueError(f"repair_text needs a str (got {type(raw).__name__})")
    text = raw
    index = list(range(len(raw)))
    text, index = _sub(text, index, _NEWLINES_RE, "\n")
    text, index = _sub(text, index, _CHARS_RE, _char_replacement)
    if join_hyphens:
        text, index = _sub(text, index, _SOFT_HYPHEN_BREAK_RE, "")
        text, index = _sub(text, index, _HYPHEN_BREAK_RE, "")
        text, index = _sub(text, index, _SOFT_HYPHEN_RE, "")
    if collapse_spaces:
        text, index = _sub(text, index, _SPACE_RUN_RE, " ")
        text, index = _sub(text, index, _SPACES_AT_BREAK_RE, "\n")
        text, index = _sub(text, index, _MANY_BREAKS_RE, "\n\n")
        text, index = _sub(text, index, _EDGES_RE, "")
    index.append(len(raw))
    return RepairedText(text=text, to_raw=tuple(index))


def map_span_to_raw(repaired: RepairedText, start: int, end: int) -> tuple[int, int]:
    """Map the half-open span ``[start, end)`` of ``repaired.text`` to a half-open span of the raw text.

    raw_start = to_raw[start]; raw_end = to_raw[end - 1] + 1 (the raw character that produced the last
    repaired character, inclusive), or raw_start for an empty span. Removed raw characters inside the span
    (a "-\\n" that was joined) are included; removed characters at its edges are not.
    """
    n = len(repaired.text)
    if not (0 <= start <= end <= n):
        raise ValueError(f"span must satisfy 0 <= start <= end <= {n} (got {start}, {end})")
    raw_start = repaired.to_raw[start]
    if end == start:
        return raw_start, raw_start
    return raw_start, repaired.to_raw[end - 1] + 1
