"""Dev only, report only: does a second feature of the reader's own candidates separate unanswerable questions
better than the margin alone?

Usage: .venv/bin/python scripts/answerability_probe.py [--model DIR]   (the reader's default path)

On the general part of the dev mix (TyDi-en dev and its synthetic negatives, ``calibrate.dev_mix``), each pair is
read with 20 candidate spans. Per pair: the margin m = best span score - null score, and two features of the
candidates' softmax p_j = softmax(s_j) (the span-choice distribution, T = 1):
- peak = s_best - logsumexp(s_j), the log-probability of the best candidate (0 when it holds all the mass);
- agreement = max_i E[F1](c_i) = max_i sum_j p_j F1(c_i, c_j), how much the candidates agree on one answer.
For each feature and weight w, the score m + w * feature replaces m in the no-answer rule; the threshold is the
4-point answerable-F1 budget one (``calibrate.budget_threshold``), and abstention is printed per kind of negative.
Nothing from test/ is read.
"""

from __future__ import annotations

import argparse
import json
import random
import re
import sys
from dataclasses import replace
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))
from engine import defaults  # noqa: E402
from engine.calibration import load_calibration  # noqa: E402
from engine.evaluation import prediction_from_reading  # noqa: E402
from engine.reader.span_choice import expected_f1  # noqa: E402
from engine.reader.transformer_reader import TransformerReader  # noqa: E402
from engine.training.calibrate import abstention_by_kind, budget_threshold, dev_mix  # noqa: E402

DATA = ROOT.parent / "shared" / "data" / "qa"
WEIGHTS = (0.0, 0.25, 0.5, 1.0, 2.0, 4.0)  # a grid with no source


def features(reading) -> tuple[float, float]:
    scores = np.array([s.score for s in reading.spans], dtype=np.float64)
    if scores.size == 0:
        return 0.0, 0.0
    peak = float(-np.log(np.exp(scores - scores.max()).sum()))  # s_best - logsumexp(s_j)
    agreement = float(expected_f1([s.text for s in reading.spans], list(scores)).max())
    return peak, agreement


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("--model", type=Path, default=ROOT / defaults.READER_MODEL_DIR)
    args = parser.parse_args()
    calibration = load_calibration(args.model)
    reader = TransformerReader(args.model, quantize=calibration.default_quantize)
    mix = [e for e in dev_mix(DATA, random.Random(7)) if not re.search(r"#[an]\d+$", e.qid)]  # general part
    base, feats = {}, {}
    for lo in range(0, len(mix), 64):
        part = mix[lo: lo + 64]
        for e, reading in zip(part, reader.read_pairs([(e.question, e.context) for e in part], n_best=20)):
            base[e.qid] = prediction_from_reading(reading, None)
            feats[e.qid] = features(reading)
    for k, name in enumerate(("peak", "agreement")):
        for w in WEIGHTS:
            # score = m + w * f; the rule abstains when null_margin = -score exceeds the threshold
            pred = {q: replace(p, best_score=p.best_score + w * feats[q][k]) for q, p in base.items()}
            b = budget_threshold(pred, mix)
            row = {"feature": name, "w": w, "threshold": round(b["threshold"], 3), "has_ans_f1": b["has_ans_f1"],
                   "has_ans_f1_all": b["has_ans_f1_all"], "negatives": b["no_ans_abstained"],
                   "by_kind": abstention_by_kind(pred, mix, b["threshold"])}
            print(json.dumps(row), flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
