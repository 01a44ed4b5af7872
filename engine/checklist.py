"""Checklists: a named list of questions that a sweep asks of every document.

File format (``NAME.checklist``, UTF-8; the checklist's name is the file stem, e.g. ``commercial``):

- a line whose first non-blank character is ``#`` is a comment; blank lines are ignored
  (``#`` elsewhere in a line is ordinary text);
- every other line is one item, either ``label :: question`` or just ``question``;
  the line is split at its first ``::``; label and question are stripped of surrounding blanks;
- a label is 1-32 characters of lowercase ASCII letters, digits and dashes, starting with a letter or digit,
  and unique in the file. Labels name the columns of the sweep grid and key its stored cells, so give one
  when the wording may change: editing the question then re-sweeps only that column and keeps its name;
- a question without a label gets a derived label: the slug of its first words (ASCII-folded, lowercased,
  runs of letters/digits joined by ``-``, as many whole words as fit in 32 characters); if that is empty or
  already taken, ``slug-<line>``, then ``q<line>``. Explicit labels are reserved first, so a derived label never
  takes an explicit one wherever it appears in the file. A derived label changes when its question is edited;
- a question is at most 300 characters; a checklist has 1-200 items.

Any violation raises :class:`ChecklistError` (a ValueError) carrying the 1-based line number.
"""

from __future__ import annotations

import re
import unicodedata
from dataclasses import dataclass
from pathlib import Path

MAX_LABEL_CHARS = 32
MAX_QUESTION_CHARS = 300
MAX_ITEMS = 200
SEPARATOR = "::"

_LABEL = re.compile(r"[a-z0-9][a-z0-9-]*\Z")
_WORD = re.compile(r"[a-z0-9]+")


class ChecklistError(ValueError):
    """A checklist file that cannot be used. ``line`` is 1-based (0: the file as a whole)."""

    def __init__(self, line: int, message: str, source: str = "checklist") -> None:
        self.line = line
        self.source = source
        self.message = message
        where = f"{source} line {line}" if line else source
        super().__init__(f"{where}: {message}")


@dataclass(frozen=True)
class ChecklistItem:
    label: str
    question: str
    line: int  # 1-based line of the item in its file


@dataclass(frozen=True)
class Checklist:
    name: str
    items: tuple[ChecklistItem, ...]

    @property
    def labels(self) -> tuple[str, ...]:
        return tuple(item.label for item in self.items)


def slugify(text: str, max_chars: int = MAX_LABEL_CHARS) -> str:
    """ASCII-folded lowercase words joined by '-', as many whole words as fit in ``max_chars`` ('' if none)."""
    folded = unicodedata.normalize("NFKD", text).encode("ascii", "ignore").decode("ascii").lower()
    out = ""
    for word in _WORD.findall(folded):
        candidate = f"{out}-{word}" if out else word[:max_chars]
        if len(candidate) > max_chars:
            break
        out = candidate
    return out


def _with_suffix(base: str, suffix: str) -> str:
    return base[: MAX_LABEL_CHARS - len(suffix)].rstrip("-") + suffix


def _split_line(raw: str, number: int, source: str) -> tuple[str | None, str]:
    """(explicit label or None, question) of one item line; checks the label and the question."""
    label: str | None = None
    question = raw
    if SEPARATOR in raw:
        label, question = (part.strip() for part in raw.split(SEPARATOR, 1))
        if not label:
            raise ChecklistError(number, f"empty label before '{SEPARATOR}' (got {raw.strip()!r})", source)
        if len(label) > MAX_LABEL_CHARS:
            raise ChecklistError(number, f"label longer than {MAX_LABEL_CHARS} characters (got {len(label)})", source)
        if not _LABEL.match(label):
            raise ChecklistError(
                number, f"a label uses only a-z, 0-9 and '-', starting with a letter or digit (got {label!r})", source)
        if not question:
            raise ChecklistError(number, f"empty question after '{SEPARATOR}' (got {raw.strip()!r})", source)
    question = question.strip()
    if len(question) > MAX_QUESTION_CHARS:
        raise ChecklistError(
            number, f"question longer than {MAX_QUESTION_CHARS} characters (got {len(question)})", source)
    return label, question


def parse_checklist(text: str, name: str) -> Checklist:
    """Parse checklist text (format in the module docstring). ``name`` names the checklist (the file stem)."""
    if not isinstance(name, str) or not name.strip():
        raise ValueError(f"a checklist needs a non-empty name (got {name!r})")
    if not isinstance(text, str):
        raise ValueError(f"checklist text must be a str (got {type(text).__name__})")
    source = f"checklist {name!r}"
    entries: list[tuple[int, str | None, str]] = []
    for number, raw in enumerate(text.removeprefix("\ufeff").splitlines(), 1):
        stripped = raw.strip()
        if not stripped or stripped.startswith("#"):
            continue
        if len(entries) == MAX_ITEMS:
            raise ChecklistError(number, f"more than {MAX_ITEMS} questions (got another one)", source)
        label, question = _split_line(stripped, number, source)
        entries.append((number, label, question))
    if not entries:
        raise ChecklistError(0, "no questions found (got only comments and blank lines)", source)
    taken: dict[str, int] = {}
    for number, label, _ in entries:
        if label is None:
            continue
        if label in taken:
            raise ChecklistError(number, f"duplicate label {label!r} (first on line {taken[label]})", source)
        taken[label] = number
    items = []
    for number, label, question in entries:
        if label is None:
            label = _derive_label(question, number, taken, source)
            taken[label] = number
        items.append(ChecklistItem(label, question, number))
    return Checklist(name.strip(), tuple(items))


def _derive_label(question: str, number: int, taken: dict[str, int], source: str) -> str:
    slug = slugify(question)
    for candidate in ((slug, _with_suffix(slug, f"-{number}")) if slug else ()) + (f"q{number}",):
        if candidate not in taken:
            return candidate
    raise ChecklistError(number, f"cannot derive a unique label; write one as 'label {SEPARATOR} question' "
                                 f"(got {slug or question!r})", source)


def load_checklist(path: Path | str) -> Checklist:
    """Read and parse a checklist file; its name is the file stem."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except UnicodeDecodeError as error:
        raise ChecklistError(0, f"not UTF-8 text (got {error.reason} at byte {error.start})", str(path)) from error
    except OSError as error:
        raise ValueError(f"cannot read checklist {str(path)!r} (got {error.strerror or error})") from error
    try:
        return parse_checklist(text, path.stem)
    except ChecklistError as error:
        raise ChecklistError(error.line, error.message, str(path)) from None
