"""Dev only, report only: one no-answer threshold per kind of text.

Usage: .venv/bin/python scripts/split_threshold_check.py MODEL_DIR [MODEL_DIR ...]   (fp32)

For each reader, ``calibrate.budget_threshold`` (4-point HasAns budget) is fitted on the dev mix's general part
(TyDi-en dev and its negatives) and on its contract part (CUAD-dev slices) separately; it prints each part's
negatives abstained by kind, and the retrieved CUAD-dev negatives of the dev check
(``retrieved_negatives.dev_check_negatives``) abstained at the contract threshold. Nothing from test/ is read.
"""

from __future__ import annotations

import json
import random
import re
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))
from engine.calibration import abstains  # noqa: E402
from engine.evaluation import predict_examples  # noqa: E402
from engine.squad_data import load_examples  # noqa: E402
from engine.reader.transformer_reader import TransformerReader  # noqa: E402
from engine.training.calibrate import abstention_by_kind, budget_threshold, dev_mix  # noqa: E402
from engine.training.retrieved_negatives import dev_check_negatives  # noqa: E402

DATA = ROOT.parent / "shared" / "data" / "qa"


def main(models: list[str]) -> int:
    mix = dev_mix(DATA, random.Random(7))
    cuad = load_examples(DATA / "dev/cuad_dev.json.gz")
    retrieved = dev_check_negatives(cuad)
    contract = [e for e in mix if re.search(r"#[an]\d+$", e.qid)]  # CUAD slices: "#a<k>" answer, "#n<k>" none
    contract_ids = {e.qid for e in contract}
    general = [e for e in mix if e.qid not in contract_ids]
    for model in models:
        reader = TransformerReader(Path(model), quantize="none")
        pred = predict_examples(reader, mix + retrieved, threshold=None)
        row = {"model": model}
        for name, part in (("general", general), ("contract", contract)):
            b = budget_threshold(pred, part)
            row[name] = {"threshold": round(b["threshold"], 3), "has_ans_f1": b["has_ans_f1"],
                         "has_ans_f1_all": b["has_ans_f1_all"],
                         "abstained_by_kind": abstention_by_kind(pred, part, b["threshold"])}
        t = row["contract"]["threshold"]
        caught = sum(abstains(pred[e.qid].null_margin, t) for e in retrieved)
        row["retrieved_at_contract_threshold"] = round(100 * caught / len(retrieved), 2)
        print(json.dumps(row), flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
