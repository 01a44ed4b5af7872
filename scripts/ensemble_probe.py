"""Dev only: would a logit ensemble of sibling readers beat its members? (If not, distilling one is not worth a run.)

Usage: .venv/bin/python scripts/ensemble_probe.py NAME=MODEL_DIR NAME=MODEL_DIR [NAME=MODEL_DIR ...]

Every reader reads the same windows (the readers share one tokenizer); the ensemble's start and end logits are the
means of its members' (fp32). Each member, the ensemble of the first two and the ensemble of all are scored with
the default expected-F1 span choice on calibrate's three answerable dev sets (``span_choice_check.dev_sets``).
Nothing from ``test/`` is read.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(ROOT / "scripts"))

from engine import defaults  # noqa: E402
from engine.evaluation import per_question_f1, prediction_from_reading  # noqa: E402
from engine.reader.transformer_reader import TransformerReader, collect_readings  # noqa: E402
from engine.reader.windows import build_windows  # noqa: E402
from span_choice_check import dev_sets  # noqa: E402


def mean_logits(members: list[list[tuple[np.ndarray, np.ndarray]]]) -> list[tuple[np.ndarray, np.ndarray]]:
    """Window by window, the element-wise mean of the members' start logits and of their end logits."""
    return [(np.mean([m[i][0] for m in members], axis=0), np.mean([m[i][1] for m in members], axis=0))
            for i in range(len(members[0]))]


def main() -> int:
    named = dict(arg.split("=", 1) for arg in sys.argv[1:])
    if len(named) < 2:
        raise ValueError(f"give at least two NAME=MODEL_DIR readers (got {sys.argv[1:]})")
    readers = {name: TransformerReader(Path(folder), quantize="none") for name, folder in named.items()}
    first = next(iter(readers.values()))
    names = list(readers)
    combos = {"+".join(names[:2]): names[:2], "+".join(names): names}
    for set_name, examples in dev_sets().items():
        pairs = [(e.question, e.context) for e in examples]
        windows = build_windows(first.tokenizer, pairs, max_length=first.max_length, stride=first.stride)
        logits = {name: reader.window_logits(windows) for name, reader in readers.items()}
        logits.update({label: mean_logits([logits[n] for n in members]) for label, members in combos.items()})
        row = {}
        for name, window_logits in logits.items():
            readings = collect_readings(pairs, windows, window_logits, 1, first.max_answer_tokens,
                                        defaults.SPAN_CHOICE_CANDIDATES, defaults.SPAN_CHOICE_TEMPERATURE)
            f1 = per_question_f1({e.qid: prediction_from_reading(r, None) for e, r in zip(examples, readings)},
                                 examples)
            row[name] = round(100 * float(np.mean([f1[e.qid] for e in examples])), 2)
        print(json.dumps({set_name: row}), flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
