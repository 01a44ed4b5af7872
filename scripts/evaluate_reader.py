"""Measure the committed reader on the public test sets and write the numbers MODEL_CARD.md reports.

Usage: .venv/bin/python scripts/evaluate_reader.py [--model MODEL_DIR] [--out MODEL_DIR/eval_report.json]
(MODEL_DIR defaults to the committed reader, engine.defaults.READER_MODEL_DIR.)
Test sets are read for reporting only; nothing here tunes anything. Each variant's speed is ms per window.
"""

from __future__ import annotations

import argparse
import json
import random
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from engine import defaults  # noqa: E402
from engine.calibration import load_calibration  # noqa: E402
from engine.evaluation import predict_examples  # noqa: E402
from engine.metrics import score_v1, score_v2  # noqa: E402
from engine.reader.transformer_reader import QUANTIZE_CHOICES, TransformerReader  # noqa: E402
from engine.squad_data import load_examples  # noqa: E402
from engine.training.calibrate import budget_threshold  # noqa: E402
from engine.training.document_threshold import document_path_predictions, document_path_scores  # noqa: E402

DATA = ROOT.parent / "shared" / "data" / "qa"
ORACLE_HASANS_BUDGET = 5.0  # the SQuAD v2.0 target: HasAns F1 within 5 points of the no-threshold run


def run(reader, examples, v2: bool, threshold: float | None) -> dict:
    golds = {e.qid: [a.text for a in e.answers] for e in examples}
    before = reader.windows_read
    started = time.perf_counter()
    predictions = predict_examples(reader, examples, threshold if v2 else None)
    seconds = time.perf_counter() - started
    texts = {k: v.text for k, v in predictions.items()}
    scores = (score_v2 if v2 else score_v1)(texts, golds).as_dict()
    windows = reader.windows_read - before
    scores.update(seconds=round(seconds, 1), windows=windows, ms_per_window=round(1000 * seconds / max(1, windows), 2))
    if v2:
        no_threshold = score_v2({k: v.span_text for k, v in predictions.items()}, golds).as_dict()
        scores["has_ans_f1_without_threshold"] = no_threshold["has_ans_f1"]
        if any(e.answers for e in examples) and any(not e.answers for e in examples):
            # Report-only view of this file's threshold curve: the most that any single threshold could abstain
            # while HasAns F1 stays within ORACLE_HASANS_BUDGET of answering everything. Nothing is picked from it.
            scores["threshold_curve_at_5pt_budget"] = budget_threshold(predictions, examples, ORACLE_HASANS_BUDGET)
    return scores


def demo_page_examples() -> list:
    """tests/data/demo_questions.jsonl as SQuAD examples whose context is the cited page's text (invented data)."""
    from engine.ingest.parse import parse_file
    from engine.squad_data import GoldAnswer, SquadExample

    out = []
    for line in (ROOT / "tests/data/demo_questions.jsonl").read_text(encoding="utf-8").splitlines():
        if not line.strip():
            continue
        q = json.loads(line)
        doc, _ = parse_file(ROOT / "demo_docs" / q["file"], q["file"])
        pages = [p for p in doc.pages if (q["page"] is None or p.number == q["page"])]
        page = next((p for p in pages if q["answer"] in p.text), pages[0] if pages else doc.pages[0])
        start = max(0, page.text.find(q["answer"]))
        out.append(SquadExample(q["id"], q["file"], q["question"], page.text, (GoldAnswer(q["answer"], start),), False))
    return out


def demo_folder_hits(model_dir: Path) -> dict:
    """Whole-folder answering on a copy of demo_docs/ (invented data): of tests/data/demo_questions.jsonl, how many
    get a top-1 / top-3 answer citing the gold file and page (``engine.evaluation.cites_gold``)."""
    import shutil
    import tempfile

    from engine.evaluation import folder_hit_counts
    from engine.workspace import Workspace

    questions = [json.loads(line) for line in (ROOT / "tests/data/demo_questions.jsonl").read_text(
        encoding="utf-8").splitlines() if line.strip()]
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp) / "demo"
        shutil.copytree(ROOT / "demo_docs", folder, ignore=shutil.ignore_patterns(".excerptor"))
        workspace = Workspace(folder, reader=TransformerReader(model_dir), calibration=load_calibration(model_dir))
        workspace.refresh()
        counts = folder_hit_counts((q, workspace.ask(q["question"], top_n=3)) for q in questions)
    counts["top3"] = counts.pop("listed")
    return counts


def main() -> int:
    parser = argparse.ArgumentParser()
    parser.add_argument("--model", type=Path, default=ROOT / defaults.READER_MODEL_DIR)
    parser.add_argument("--out", type=Path, default=None)
    parser.add_argument("--cuad-sample", type=int, default=150)
    parser.add_argument("--skip-squad-full", action="store_true")
    parser.add_argument("--squad-sample", type=int, default=0, help="random N questions of each SQuAD dev file (0 = all)")
    parser.add_argument("--only", nargs="*", default=None,
                        help="sections to run (default: all): variants demo demo_folder cuad_dev xquad300 tydi "
                             "squad (= squad_v1 squad_v2) cuad cuad_app")
    args = parser.parse_args()
    args.model = args.model.resolve()
    calibration = load_calibration(args.model)
    # A model folder outside the repository (an old reader restored to /tmp, say) is named by its absolute path.
    name = args.model.relative_to(ROOT) if args.model.is_relative_to(ROOT) else args.model
    report: dict = {"model": str(name), "threshold": calibration.null_margin_threshold,
                    "default_quantize": calibration.default_quantize}
    out = args.out or args.model / "eval_report.json"
    report["squad_sample"] = args.squad_sample or "all"
    report["cuad_sample"] = args.cuad_sample

    def save(section: str) -> None:  # after every section, so a cut-short run keeps what it measured
        out.write_text(json.dumps(report, indent=2) + "\n", encoding="utf-8")
        print(section, json.dumps(report.get(section)), flush=True)

    xquad = load_examples(DATA / "test/xquad_en.json.gz")
    report["xquad_en"] = {}
    wanted = (lambda name: args.only is None or name in args.only)
    for mode in (QUANTIZE_CHOICES if wanted("variants") else ()):
        reader = TransformerReader(args.model, quantize=mode)
        report["xquad_en"][mode] = run(reader, xquad, False, None)
        save("xquad_en")
    reader = TransformerReader(args.model)  # the default inference path
    if wanted("demo"):
        report["demo_questions_given_page"] = run(reader, demo_page_examples(), False, None)
        save("demo_questions_given_page")
    if wanted("demo_folder"):
        report["demo_folder"] = demo_folder_hits(args.model)
        save("demo_folder")
    if wanted("cuad_dev"):
        cuad_dev = load_examples(DATA / "dev/cuad_dev.json.gz")
        report["cuad_dev_sample"] = run(reader, random.Random(1).sample(cuad_dev, min(args.cuad_sample, len(cuad_dev))),
                                        True, calibration.null_margin_threshold)
        save("cuad_dev_sample")
    if wanted("xquad300"):
        report["xquad_en_first300_default"] = run(reader, xquad[:300], False, None)
        save("xquad_en_first300_default")
    if wanted("tydi"):
        report["tydiqa_en_dev"] = run(reader, load_examples(DATA / "dev/tydiqa_goldp_en_dev.json.gz"), False, None)
        save("tydiqa_en_dev")

    def squad(name: str) -> list:
        items = load_examples(DATA / name)
        if args.squad_sample:
            items = random.Random(2).sample(items, min(args.squad_sample, len(items)))
        return items

    if (wanted("squad") or wanted("squad_v1")) and not args.skip_squad_full:
        report["squad_v1.1_dev"] = run(reader, squad("test/squad_dev_v1.1.json.gz"), False, None)
        save("squad_v1.1_dev")
    if (wanted("squad") or wanted("squad_v2")) and not args.skip_squad_full:
        report["squad_v2.0_dev"] = run(reader, squad("test/squad_dev_v2.0.json.gz"), True,
                                       calibration.null_margin_threshold)
        save("squad_v2.0_dev")
    if wanted("cuad"):
        cuad = load_examples(DATA / "test/cuad_test.json.gz")
        sample = random.Random(0).sample(cuad, min(args.cuad_sample, len(cuad)))
        report["cuad_test_sample"] = run(reader, sample, True, calibration.null_margin_threshold)
        save("cuad_test_sample")
    if wanted("cuad_app"):  # every CUAD test question asked of its own contract the app's way (about 12 minutes)
        cuad = load_examples(DATA / "test/cuad_test.json.gz")
        predictions = document_path_predictions(reader, calibration, cuad)
        report["cuad_test_app_path"] = document_path_scores(predictions, cuad, calibration.null_margin_threshold)
        save("cuad_test_app_path")
    print(f"wrote {out}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
