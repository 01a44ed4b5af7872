"""Fit and judge a no-answer threshold for the app's documents on whole contracts (rule contract30).

Usage: .venv/bin/python scripts/document_threshold_check.py [--model DIR] [--out runs/x.json]

Every CUAD-dev question is asked of its own contract the app's way (``document_threshold``). A threshold is fitted
on the contracts of the "fit" half (``calibrate.budget_threshold``, the calibration's own 4-point answerable-F1
budget), and both it and the reader's shared threshold are scored on the "judge" half. Per-question margins and
first answers go to ``--out`` so that a threshold can be re-scored without reading again. CUAD test is read the
same way, report only, by ``evaluate_reader.py --only cuad_app``.
"""

from __future__ import annotations

import argparse
import json
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from engine import defaults  # noqa: E402
from engine.calibration import load_calibration  # noqa: E402
from engine.reader.transformer_reader import TransformerReader  # noqa: E402
from engine.squad_data import load_examples  # noqa: E402
from engine.training.calibrate import HASANS_F1_BUDGET  # noqa: E402
from engine.training.document_threshold import (  # noqa: E402
    document_path_predictions, fit_and_judge)

DATA = ROOT.parent / "shared" / "data" / "qa"


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("--model", type=Path, default=ROOT / defaults.READER_MODEL_DIR)
    parser.add_argument("--out", type=Path, default=None)
    args = parser.parse_args()
    calibration = load_calibration(args.model)
    reader = TransformerReader(args.model, quantize=calibration.default_quantize)
    examples = load_examples(DATA / "dev/cuad_dev.json.gz")
    started = time.time()
    predictions = document_path_predictions(reader, calibration, examples,
                                            log=lambda m: print(f"{m} ({time.time() - started:.0f} s)", flush=True))
    report: dict = {"model": str(args.model), "quantize": calibration.default_quantize,
                    "shared_threshold": calibration.null_margin_threshold, "seconds": round(time.time() - started),
                    **fit_and_judge(predictions, examples, calibration.null_margin_threshold, HASANS_F1_BUDGET)}
    print(json.dumps(report, indent=1), flush=True)
    if args.out is not None:
        rows = {e.qid: {"title": e.title, "null_margin": predictions[e.qid].null_margin,
                        "first_answer": predictions[e.qid].span_text} for e in examples}
        args.out.write_text(json.dumps({"report": report, "questions": rows}) + "\n", encoding="utf-8")
    return 0


if __name__ == "__main__":
    sys.exit(main())
