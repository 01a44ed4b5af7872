"""Dev only: contract term questions (durations and end dates) for one or more readers, report only.

Usage: .venv/bin/python scripts/term_check.py MODEL_DIR [MODEL_DIR ...] [--quantize none|default]

The set is ``engine.training.term_questions`` over CUAD dev (seed 7): "How long is the initial term / each renewal
term?", "How much notice ... to stop this agreement from renewing?", "On what date does this agreement expire?",
each against one slice of its contract. Prints F1 (official SQuAD v1.1 metric) per reader, per question kind, and how
many duration questions were answered with a calendar date (the date-type confusion). Then the same question is
asked of the contract's opening slice (its title, parties and own date) where the answer lies past it: how
often the opening slice's best span has the higher margin (best span - null score), so that a reader ranking
passages by margin alone would answer from the preamble. With two readers, the paired bootstrap of the second against
the first. Nothing from ``test/`` is read.
"""

from __future__ import annotations

import argparse
import json
import random
import sys
from collections import defaultdict
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from engine.evaluation import paired_bootstrap, per_question_f1, predict_examples  # noqa: E402
from engine.reader.transformer_reader import TransformerReader  # noqa: E402
from engine.squad_data import load_examples  # noqa: E402
from engine.training.term_questions import CALENDAR_DATE, opening_slice_negatives, term_questions  # noqa: E402

DATA = ROOT.parent / "shared" / "data" / "qa"


def term_dev_set(seed: int = 7) -> tuple[list, list]:
    """The term questions (seed 7 places the slices), and the same questions against their contract's opening slice
    where the answer lies past it (``opening_slice_negatives``)."""
    answerable = [e for e in load_examples(DATA / "dev/cuad_dev.json.gz") if e.answers]
    return term_questions(answerable, random.Random(seed)), opening_slice_negatives(answerable)


def measure(model: Path, quantize: str | None, examples: list, openings: list) -> tuple[dict, np.ndarray]:
    reader = TransformerReader(model, quantize=None if quantize == "default" else quantize)
    predictions = predict_examples(reader, examples, threshold=None)
    opening = predict_examples(reader, openings, threshold=None)
    opening_wins = [o for o in openings
                    if -opening[o.qid].null_margin > -predictions[o.qid.replace("#opening", "#term")].null_margin]
    f1 = per_question_f1(predictions, examples)
    by_kind: dict[str, list[float]] = defaultdict(list)
    dated = 0
    for e in examples:
        by_kind[e.question].append(f1[e.qid])
        if not e.question.startswith("On what date") and CALENDAR_DATE.search(predictions[e.qid].span_text or ""):
            dated += 1
    durations = sum(1 for e in examples if not e.question.startswith("On what date"))
    row = {"model": str(model), "path": reader.quantize, "questions": len(examples),
           "f1": round(100 * float(np.mean(list(f1.values()))), 2),
           "by_question": {q: [len(v), round(100 * float(np.mean(v)), 2)] for q, v in sorted(by_kind.items())},
           "duration_questions_answered_with_a_date": [dated, durations],
           "opening_slice_has_the_higher_margin": [len(opening_wins), len(openings)],
           "of_which_a_calendar_date": sum(1 for o in opening_wins if CALENDAR_DATE.search(opening[o.qid].span_text))}
    return row, np.array([f1[e.qid] for e in examples])


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("models", nargs="+", type=Path)
    parser.add_argument("--quantize", default="none", help="a quantize mode, or 'default' for each reader's own")
    args = parser.parse_args()
    examples, openings = term_dev_set()
    scores = []
    for model in args.models:
        row, f1 = measure(model, args.quantize, examples, openings)
        scores.append(f1)
        print(json.dumps(row), flush=True)
    if len(scores) == 2:
        gain, low, high = paired_bootstrap(scores[0], scores[1])
        print(json.dumps({"gain_of_second": round(100 * gain, 2), "gain_95ci": [round(100 * low, 2),
                                                                                 round(100 * high, 2)]}))
    return 0


if __name__ == "__main__":
    sys.exit(main())
