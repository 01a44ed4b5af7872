"""The app's own colour scheme: a Textual theme plus the few text styles the widgets share.

Confidence bands (UI convention, no source): ``firm`` >= 0.8, ``fair`` >= the engine's low-confidence line,
``low`` below it (or whenever the engine flagged the answer as low confidence).
"""

from __future__ import annotations

from textual.theme import Theme

THEME_NAME = "excerptor-harbour"

THEME = Theme(
    name=THEME_NAME,
    primary="#3E8E9E",  # harbour teal
    secondary="#9A7BC2",  # heather
    accent="#D9A441",  # brass
    warning="#D9A441",
    error="#C9504E",
    success="#6FA36B",
    foreground="#DDE3E8",
    background="#12171D",
    surface="#19212A",
    panel="#223040",
    dark=True,
)

SPAN = "bold #12171D on #E8C35A"  # the exact answer characters
CLAUSE = "on #24344A"  # the clause around the answer
MATCH = "#12171D on #8FB8C9"  # a find-in-document hit
MATCH_NOW = "bold #12171D on #E58F65"  # the current find hit
MUTED = "#8594A3"
BELOW_THRESHOLD = "italic #E58F65"  # a closest span shown after an abstention, not an answer
FILE = "bold #8FC7D2"

BAND_STYLE = {
    "firm": "bold #12171D on #6FA36B",
    "fair": "bold #12171D on #8FA9D6",
    "low": "bold #12171D on #E58F65",
    "none": "#8594A3",
}
DECISION_STYLE = {
    "accepted": "bold #6FA36B",
    "rejected": "bold #C9504E",
    "corrected": "bold #9A7BC2",
}
DECISION_MARK = {"accepted": "✔ accepted", "rejected": "✘ rejected", "corrected": "✎ corrected"}
FIRM_FROM = 0.8


def band(score: float | None, low: bool) -> str:
    """'firm' | 'fair' | 'low' | 'none' (no score: an abstained cell)."""
    if score is None:
        return "none"
    if low:
        return "low"
    return "firm" if score >= FIRM_FROM else "fair"

BAND_FG = {"firm": "#8CC084", "fair": "#8FA9D6", "low": "bold #E58F65", "none": "#8594A3"}
DECISION_GLYPH = {"accepted": "✔", "rejected": "✘", "corrected": "✎"}
