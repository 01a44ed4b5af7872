"""Dev-only checks of the app's own answering path over an open corpus (report only; nothing is tuned here).

Usage: .venv/bin/python scripts/folder_checks.py [--model DIR] [--data-dir ../shared/data/qa]

The corpus is the 440 TyDi-en dev paragraphs, searched with BM25 (top ``TOP_K_PASSAGES``), read with the reader's
default path and ranked by ``engine.answering.rank_answers``, as the app does. Prints:
- first-answer F1 at the calibrated threshold when the answers are listed by confidence (before 2026-12-03) and
  in fused order (now), with the paired-bootstrap interval of the difference;
- how often the app abstains on a question the corpus cannot answer (the same question asked of the corpus
  without every paragraph that holds one of its gold answers), at the calibrated threshold, and the most it
  could abstain while first-answer F1 stays within ``HASANS_F1_BUDGET`` points of no threshold.
"""

from __future__ import annotations

import argparse
import json
import sys
from dataclasses import replace
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from engine import defaults  # noqa: E402
from engine.answering import rank_answers  # noqa: E402
from engine.bm25 import Bm25Index  # noqa: E402
from engine.calibration import abstains, load_calibration  # noqa: E402
from engine.evaluation import open_corpus_passages, paired_bootstrap  # noqa: E402
from engine.metrics import f1_v1  # noqa: E402
from engine.reader.transformer_reader import TransformerReader  # noqa: E402
from engine.squad_data import load_examples  # noqa: E402
from engine.text_tokens import tokenize_for_search  # noqa: E402
from engine.training.calibrate import HASANS_F1_BUDGET  # noqa: E402


def ask(reader, calibration, question: str, index: Bm25Index, positions: list[int], contexts: list[str], top_n: int):
    """rank_answers over the top-k BM25 paragraphs; returns (AskResult, best margin over all read spans).
    ``positions[j]`` is the context index of the index's j-th paragraph."""
    hits = [(positions[pos], score) for pos, score in index.top_k(tokenize_for_search(question),
                                                                  defaults.TOP_K_PASSAGES)]
    passages = open_corpus_passages(contexts, hits)
    readings = reader.read_pairs([(question, sp.passage.text) for sp in passages], n_best=5)
    best = max((r.margin(i) for r in readings for i in range(len(r.spans))), default=-np.inf)
    return rank_answers(question, passages, readings, calibration, top_n), best


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("--model", type=Path, default=ROOT / defaults.READER_MODEL_DIR)
    parser.add_argument("--data-dir", type=Path, default=ROOT.parent / "shared/data/qa")
    args = parser.parse_args()
    reader, calibration = TransformerReader(args.model), load_calibration(args.model)
    no_threshold = replace(calibration, null_margin_threshold=float("inf"))
    examples = load_examples(args.data_dir / "dev/tydiqa_goldp_en_dev.json.gz")
    contexts = sorted({e.context for e in examples})
    tokens = [tokenize_for_search(c) for c in contexts]
    everything = list(range(len(contexts)))
    full = Bm25Index.build(tokens)
    by_confidence, fused, margins_with, margins_without = [], [], [], []
    for e in examples:
        golds = [a.text for a in e.answers]
        f1 = (lambda result: max(f1_v1(result.answers[0].text, g) for g in golds) if result.answers else 0.0)
        five, best = ask(reader, no_threshold, e.question, full, everything, contexts, defaults.TOP_N_ANSWERS)
        fused.append(f1(five))
        by_confidence.append(f1(replace(five, answers=tuple(sorted(five.answers, key=lambda a: -a.score)))))
        margins_with.append(best)
        kept = [i for i in everything if not any(g in contexts[i] for g in golds)]
        _, best_without = ask(reader, no_threshold, e.question, Bm25Index.build([tokens[i] for i in kept]), kept,
                              contexts, 1)
        margins_without.append(best_without)
    fused_f1, with_m, without_m = np.array(fused), np.array(margins_with), np.array(margins_without)
    answered = ~abstains(-with_m, calibration.null_margin_threshold)
    app_by_confidence, app_fused = np.array(by_confidence) * answered, fused_f1 * answered
    gain, low, high = paired_bootstrap(app_by_confidence.tolist(), app_fused.tolist())

    def at(threshold: float) -> dict:
        return {"threshold": round(float(threshold), 3),
                "first_answer_f1": round(100 * float(np.mean(fused_f1 * ~abstains(-with_m, threshold))), 2),
                "unanswerable_abstained_pct": round(100 * float(np.mean(abstains(-without_m, threshold))), 2)}

    open_f1 = 100 * float(fused_f1.mean())
    curve = [at(t) for t in np.unique(np.round(np.concatenate([-with_m, -without_m]), 3))]
    within = [c for c in curve if c["first_answer_f1"] >= open_f1 - HASANS_F1_BUDGET]
    print(json.dumps({
        "questions": len(examples),
        "at_calibrated_threshold_first_answer_f1_by_confidence": round(100 * float(app_by_confidence.mean()), 2),
        "at_calibrated_threshold_first_answer_f1_fused_order": round(100 * float(app_fused.mean()), 2),
        "fused_gain_ci95": [round(100 * gain, 2), round(100 * low, 2), round(100 * high, 2)],
        "no_threshold_first_answer_f1_fused_order": round(open_f1, 2),
        "at_calibrated_threshold": at(calibration.null_margin_threshold),
        "most_abstention_within_budget": max(within, key=lambda c: c["unanswerable_abstained_pct"]) if within else None,
    }, indent=2))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
