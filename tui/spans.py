"""Plain-text building blocks: rich ``Text`` objects (never parsed as markup), highlights, clauses, snippets.

Offsets are half-open ``[start, end)`` into the string they are given.
"""

from __future__ import annotations

import re
from typing import Iterable

from rich.text import Text

from tui import palette

# A clause starts after a blank line, at a line opening with a clause number ("12.2 ", "3. ", "(b) ") or after a
# sentence end (". " + capital letter). A clause ends at a sentence end or before such a line.
_CLAUSE_START = re.compile(r"\n\s*\n|\n(?=\s*(?:\d+(?:\.\d+)*\.?|\([a-z0-9]{1,4}\))\s)|(?<=[.;!?])\s+(?=[A-Z(\"“])")
_CLAUSE_END = re.compile(r"[.;!?](?=\s|$)|\n\s*\n|\n(?=\s*(?:\d+(?:\.\d+)*\.?|\([a-z0-9]{1,4}\))\s)")
CLAUSE_REACH = 700  # characters searched on either side of the span


def plain(text: str, style: str = "") -> Text:
    """``text`` as literal characters: square brackets stay brackets."""
    return Text(text, style=style, end="")


def styled(text: str, marks: Iterable[tuple[int, int, str]], base: str = "") -> Text:
    """``text`` with each ``(start, end, style)`` applied in order (later marks win), clipped to the text."""
    out = Text(text, style=base, end="")
    n = len(text)
    for start, end, style in marks:
        s, e = max(0, start), min(n, end)
        if s < e:
            out.stylize(style, s, e)
    return out


def text_under(text: Text, style: str) -> list[str]:
    """The runs of characters that carry exactly ``style`` (what a reader sees highlighted)."""
    return [text.plain[span.start:span.end] for span in text.spans if str(span.style) == style]


def clause_bounds(text: str, start: int, end: int) -> tuple[int, int]:
    """The clause around ``[start, end)``: from the last clause start before it to the first clause end after it."""
    if not 0 <= start <= end <= len(text):
        raise ValueError(f"span must lie inside the text (got {start}-{end} of {len(text)})")
    lo = max(0, start - CLAUSE_REACH)
    left = lo if lo > 0 else 0
    for match in _CLAUSE_START.finditer(text, lo, start):
        left = match.end()
    right = min(len(text), end + CLAUSE_REACH)
    found = _CLAUSE_END.search(text, end, right)
    if found is not None:
        right = found.end() if found.group()[:1] in ".;!?" else found.start()
    while left < start and text[left].isspace():
        left += 1
    return left, max(right, end)


def one_line(text: str) -> str:
    """Runs of whitespace (line breaks included) collapsed to single spaces."""
    return " ".join(text.split())


def snippet(passage: str, start: int, end: int, words: int = 4) -> Text:
    """A one-line view: ``words`` words either side of the span, the span emphasised, whitespace collapsed.

    The span joins its neighbours with a space only where the passage has whitespace there ("days' notice" keeps
    its apostrophe against the span "days").
    """
    head, tail = passage[:start], passage[end:]
    before = " ".join(head.split()[-words:])
    after = " ".join(tail.split()[:words])
    middle = " ".join(passage[start:end].split())
    out = Text(end="")
    out.append("…" + before + (" " if head[-1:].isspace() else "") if before else "", palette.MUTED)
    out.append(middle, "bold underline")
    out.append((" " if tail[:1].isspace() else "") + after + "…" if after else "", palette.MUTED)
    return out


def confidence_chip(score: float | None, low: bool) -> Text:
    """' LOW 38% ' style chip; abstentions show '  —  '."""
    kind = palette.band(score, low)
    if score is None:
        return Text("  —   ", style=palette.BAND_STYLE["none"], end="")
    percent = f"{round(score * 100):>3d}%"
    label = f" LOW {percent} " if kind == "low" else f"     {percent} "
    return Text(label, style=palette.BAND_STYLE[kind], end="")


def band_legend() -> Text:
    """One line naming the confidence bands in their colours."""
    out = Text("bands: ", style=palette.MUTED, end="")
    for kind, words in (("firm", f"firm ≥{round(palette.FIRM_FROM * 100)}%"), ("fair", "fair"),
                        ("low", "LOW"), ("none", "— none")):
        out.append(" " + words + " ", palette.BAND_STYLE[kind] if kind != "none" else palette.MUTED)
        out.append(" ")
    return out


def decision_chip(decision: str | None) -> Text:
    if decision is None:
        return Text("unreviewed", style=palette.MUTED, end="")
    return Text(palette.DECISION_MARK.get(decision, decision), style=palette.DECISION_STYLE.get(decision, ""), end="")


def where(file: str, locator: str | None) -> Text:
    out = Text(file, style=palette.FILE, end="")
    if locator:
        out.append(" · " + locator, palette.MUTED)
    return out
