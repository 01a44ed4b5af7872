"""Dev only, report only: how many BM25 passages the app should read per question (``TOP_K_PASSAGES``).

Usage: .venv/bin/python scripts/top_k_check.py [--model DIR] [--ks 1 2 4 8 12]

Every CUAD-dev question is asked of its own contract the app's way (``document_threshold``): the contract is cut
into the app's passages and BM25 ranks them; the top max(ks) are read once, and for each k the first k of them are
ranked by ``rank_answers``. Printed per k, at the reader's calibrated threshold: answerable F1 (first answer, 0 when
abstained) and with no threshold, and no-answer abstention. Nothing from test/ is read.
"""

from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))
from engine import defaults  # noqa: E402
from engine.calibration import load_calibration  # noqa: E402
from engine.reader.transformer_reader import TransformerReader  # noqa: E402
from engine.squad_data import load_examples  # noqa: E402
from engine.training.document_threshold import document_path_predictions_by_k, document_path_scores  # noqa: E402

DATA = ROOT.parent / "shared" / "data" / "qa"


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("--model", type=Path, default=ROOT / defaults.READER_MODEL_DIR)
    parser.add_argument("--ks", type=int, nargs="+", default=[1, 2, 4, 8, 12])
    args = parser.parse_args()
    calibration = load_calibration(args.model)
    reader = TransformerReader(args.model, quantize=calibration.default_quantize)
    examples = load_examples(DATA / "dev/cuad_dev.json.gz")
    predictions = document_path_predictions_by_k(reader, calibration, examples, args.ks, log=print)
    for k in args.ks:
        row = document_path_scores(predictions[k], examples, calibration.null_margin_threshold)
        print(json.dumps({"k": k, **row}), flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
