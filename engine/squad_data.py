"""Read SQuAD-format JSON (v1.1 or v2.0, optionally gzip) into flat, frozen examples.

Format (Rajpurkar et al., 2016 and 2018): ``{"data": [{"title", "paragraphs": [{"context", "qas": [{"id",
"question", "answers": [{"text", "answer_start"}], "is_impossible"?}]}]}]}``.
"""

from __future__ import annotations

import gzip
import json
from dataclasses import dataclass
from pathlib import Path
from typing import Iterator


@dataclass(frozen=True)
class GoldAnswer:
    text: str
    start: int  # character offset in the context


@dataclass(frozen=True)
class SquadExample:
    qid: str
    title: str
    question: str
    context: str
    answers: tuple[GoldAnswer, ...]
    is_impossible: bool


def read_squad_json(path: Path | str) -> dict:
    """Load the raw JSON object from ``.json`` or ``.json.gz``."""
    path = Path(path)
    if not path.exists():
        raise ValueError(f"SQuAD file not found (got {path})")
    opener = gzip.open if path.suffix == ".gz" else open
    with opener(path, "rt", encoding="utf-8") as handle:
        return json.load(handle)


def iter_examples(raw: dict) -> Iterator[SquadExample]:
    """Flatten articles → paragraphs → questions. An impossible question has no answers."""
    if "data" not in raw:
        raise ValueError(f"not SQuAD-format JSON: no 'data' key (got keys {sorted(raw)[:5]})")
    for article in raw["data"]:
        title = article.get("title", "")
        for paragraph in article["paragraphs"]:
            context = paragraph["context"]
            for qa in paragraph["qas"]:
                impossible = bool(qa.get("is_impossible", False))
                answers = () if impossible else tuple(
                    GoldAnswer(a["text"], int(a["answer_start"])) for a in qa.get("answers", [])
                )
                yield SquadExample(str(qa["id"]), title, qa["question"], context, answers,
                                   impossible or not answers)


def load_examples(path: Path | str, limit: int | None = None) -> list[SquadExample]:
    """All examples of a file, in file order, at most ``limit`` of them."""
    if limit is not None and limit < 1:
        raise ValueError(f"limit must be >= 1 (got {limit})")
    out: list[SquadExample] = []
    for example in iter_examples(read_squad_json(path)):
        out.append(example)
        if limit is not None and len(out) >= limit:
            break
    return out
