"""Compare two readers on one SQuAD-format file, question by question, with a paired bootstrap interval.

Usage: .venv/bin/python scripts/compare_readers.py OLD_MODEL_DIR NEW_MODEL_DIR [--data test/xquad_en.json.gz]
Prints each reader's F1 (default inference path of each) and the mean F1 gain of NEW over OLD with its 95 %
interval. Reporting only: nothing is tuned on the file.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from engine.evaluation import paired_bootstrap, per_question_f1, predict_examples  # noqa: E402
from engine.reader.transformer_reader import TransformerReader  # noqa: E402
from engine.squad_data import load_examples  # noqa: E402

DATA = ROOT.parent / "shared" / "data" / "qa"


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("old", type=Path)
    parser.add_argument("new", type=Path)
    parser.add_argument("--data", default="test/xquad_en.json.gz")
    parser.add_argument("--quantize", default=None, help="one variant for both (default: each reader's own)")
    args = parser.parse_args()
    examples = [e for e in load_examples(DATA / args.data) if e.answers]
    scores = {}
    for name, folder in (("old", args.old), ("new", args.new)):
        reader = TransformerReader(folder, quantize=args.quantize)
        scores[name] = per_question_f1(predict_examples(reader, examples, threshold=None), examples)
    ids = sorted(scores["old"])
    old = [scores["old"][q] for q in ids]
    new = [scores["new"][q] for q in ids]
    gain, low, high = paired_bootstrap(old, new)
    print(json.dumps({"data": args.data, "questions": len(ids), "quantize": args.quantize or "each reader's default",
                      "old": str(args.old), "new": str(args.new), "old_f1": round(100 * sum(old) / len(old), 2),
                      "new_f1": round(100 * sum(new) / len(new), 2), "gain_f1": round(100 * gain, 2),
                      "gain_95ci": [round(100 * low, 2), round(100 * high, 2)]}))
    return 0


if __name__ == "__main__":
    sys.exit(main())
