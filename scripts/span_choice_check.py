"""Dev only: which span to answer with, judged on three dev sets, each read once.

Usage: .venv/bin/python scripts/span_choice_check.py [MODEL_DIR] [--quantize none]

Sets (all from ``../shared/data/qa/dev``, as ``calibrate.dev_answer_sets`` builds them with seed 7): TyDi-en dev
(440 questions), CUAD-dev answer slices (918), and CUAD-dev short answers (183:
``engine.training.short_contract_questions``, titles, parties and dates asked as plain questions).
Decoders: the top-scored span, and the expected-F1 choice among 20 spans at temperatures 0.5 and 1 (the default).
Prints per-set F1 for each decoder and the paired-bootstrap gain of each against the default. Nothing from
``test/`` is read.
"""

from __future__ import annotations

import argparse
import json
import random
import sys
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from engine import defaults  # noqa: E402
from engine.evaluation import paired_bootstrap, per_question_f1, prediction_from_reading  # noqa: E402
from engine.reader.transformer_reader import TransformerReader, collect_readings  # noqa: E402
from engine.reader.windows import build_windows  # noqa: E402
from engine.training.calibrate import dev_answer_sets  # noqa: E402

DATA = ROOT.parent / "shared" / "data" / "qa"
DECODERS = {"top-scored span": (1, 1.0), "expected F1, T = 0.5": (20, 0.5), "expected F1, T = 1": (20, 1.0)}
REFERENCE = "expected F1, T = 1"


def dev_sets(seed: int = 7) -> dict[str, list]:
    """calibrate's three answerable dev sets, under readable names."""
    sets = dev_answer_sets(DATA, random.Random(seed))
    return dict(zip(("TyDi-en dev", "CUAD-dev slices", "CUAD-dev short answers"), sets.values()))


def per_decoder_f1(reader: TransformerReader, examples: list) -> dict[str, np.ndarray]:
    pairs = [(e.question, e.context) for e in examples]
    windows = build_windows(reader.tokenizer, pairs, max_length=reader.max_length, stride=reader.stride)
    logits = reader.window_logits(windows)
    out = {}
    for name, (candidates, temperature) in DECODERS.items():
        readings = collect_readings(pairs, windows, logits, 1, reader.max_answer_tokens, candidates, temperature)
        predictions = {e.qid: prediction_from_reading(r, None) for e, r in zip(examples, readings)}
        f1 = per_question_f1(predictions, examples)
        out[name] = np.array([f1[e.qid] for e in examples])
    return out


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("model", nargs="?", type=Path, default=ROOT / defaults.READER_MODEL_DIR)
    parser.add_argument("--quantize", default="none")
    args = parser.parse_args()
    reader = TransformerReader(args.model, quantize=args.quantize)
    report = {"model": str(args.model), "quantize": args.quantize, "sets": {}}
    for set_name, examples in dev_sets().items():
        scores = per_decoder_f1(reader, examples)
        row = {"questions": len(examples)}
        for name, f in scores.items():
            gain, low, high = paired_bootstrap(scores[REFERENCE], f)
            row[name] = {"f1": round(100 * float(f.mean()), 2), "gain_vs_default": round(100 * gain, 2),
                         "gain_95ci": [round(100 * low, 2), round(100 * high, 2)],
                         "better": int((f > scores[REFERENCE]).sum()), "worse": int((f < scores[REFERENCE]).sum())}
        report["sets"][set_name] = row
        print(json.dumps({set_name: row}), flush=True)
    report["mean_f1"] = {name: round(float(np.mean([report["sets"][s][name]["f1"] for s in report["sets"]])), 2)
                         for name in DECODERS}
    print(json.dumps(report, indent=1))
    return 0


if __name__ == "__main__":
    sys.exit(main())
