"""Tiny SQuAD-format training files for tests of the training command (made-up places and years)."""

from __future__ import annotations

import gzip
import json
from pathlib import Path


def write_general_file(folder: Path, count: int = 24, name: str = "general.json.gz") -> str:
    """Write ``count`` one-question paragraphs under folder/train/ and return the path relative to ``folder``."""
    paragraphs = []
    for k in range(count):
        context = f"The depot in district {k} was opened in {1950 + k} by the county."
        year = str(1950 + k)
        paragraphs.append({"context": context, "qas": [{
            "id": f"q{k}", "question": f"When was the depot in district {k} opened?",
            "answers": [{"text": year, "answer_start": context.index(year)}]}]})
    (folder / "train").mkdir(exist_ok=True)
    with gzip.open(folder / "train" / name, "wt", encoding="utf-8") as handle:
        json.dump({"data": [{"title": "depots", "paragraphs": paragraphs}]}, handle)
    return f"train/{name}"
