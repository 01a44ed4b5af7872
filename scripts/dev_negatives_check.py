"""Dev only: how well a trained reader tells answerable from unanswerable, before it is calibrated.

Usage: .venv/bin/python scripts/dev_negatives_check.py MODEL_DIR [--quantize none]

On calibrate's dev mix (``calibrate.dev_mix``, seed 7: TyDi-en dev, its topic-near, swapped, negated and antonym
negatives, and CUAD-dev slices), with no threshold applied, prints:
- the reader's own 4-point budget threshold (``calibrate.budget_threshold``): HasAns F1 there and with no threshold,
  and the share of dev negatives abstained, overall and by kind;
- the best dev-mix v2.0 F1 over all thresholds (``calibrate.best_threshold``);
- the share of retrieval-matched CUAD-dev negatives abstained at that same threshold: for 400 random CUAD-dev
  questions (seed 7), the best BM25 slice of the contract that holds no answer (``training.retrieved_negatives``),
  the kind of passage the app reads when a clause is absent. They are not part of the mix the threshold is fit on.
These are the numbers the candidate rules in docs/decision_rules.md compare. Nothing from ``test/`` is read.
"""

from __future__ import annotations

import argparse
import json
import random
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from engine.calibration import abstains  # noqa: E402
from engine.evaluation import predict_examples  # noqa: E402
from engine.squad_data import load_examples  # noqa: E402
from engine.reader.transformer_reader import TransformerReader  # noqa: E402
from engine.training.calibrate import abstention_by_kind, best_threshold, budget_threshold, dev_mix  # noqa: E402
from engine.training.retrieved_negatives import dev_check_negatives  # noqa: E402

DATA = ROOT.parent / "shared" / "data" / "qa"


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("model", type=Path)
    parser.add_argument("--quantize", default="none")
    parser.add_argument("--seed", type=int, default=7)
    args = parser.parse_args()
    reader = TransformerReader(args.model, quantize=args.quantize)
    mix = dev_mix(DATA, random.Random(args.seed))
    predictions = predict_examples(reader, mix, threshold=None)
    budget = budget_threshold(predictions, mix)
    budget["no_ans_abstained_by_kind"] = abstention_by_kind(predictions, mix, budget["threshold"])
    best_t, best_v2 = best_threshold(predictions, mix)
    cuad = load_examples(DATA / "dev/cuad_dev.json.gz")
    retrieved = dev_check_negatives(cuad, args.seed)
    held_out = predict_examples(reader, retrieved, threshold=None)
    caught = sum(abstains(held_out[e.qid].null_margin, budget["threshold"]) for e in retrieved)
    print(json.dumps({"model": str(args.model), "quantize": args.quantize, "dev_mix_size": len(mix),
                      "budget": budget, "best_v2_f1": round(best_v2, 2), "best_v2_threshold": round(best_t, 3),
                      "cuad_retrieved_negatives": len(retrieved),
                      "cuad_retrieved_abstained": round(100.0 * caught / max(1, len(retrieved)), 2)}, indent=1))
    return 0


if __name__ == "__main__":
    sys.exit(main())
