"""CLI commands for the reader: ``train-reader`` and ``evaluate``."""

from __future__ import annotations

import argparse
import dataclasses
import json
import sys
import time
from pathlib import Path


def add_train_parser(sub) -> None:
    from engine.training.train import TrainConfig

    p = sub.add_parser("train-reader", help="fine-tune the span reader on SQuAD-format data (CPU, resumable)")
    for f in dataclasses.fields(TrainConfig):
        if f.name in ("extra", "train_files"):
            continue
        flag = "--" + f.name.replace("_", "-")
        if f.type in ("bool", bool):
            p.add_argument(flag, type=lambda s: s.lower() in ("1", "true", "yes"), default=f.default)
        else:
            cast = {"int": int, "float": float, "str": str}.get(str(f.type), str)
            p.add_argument(flag, type=cast, default=f.default)
    p.add_argument("--train-files", nargs="*", default=None,
                   help="files under --data-dir (default: all train/); FILE:N keeps N random questions of FILE")
    p.set_defaults(handler=run_train)


def run_train(args) -> int:
    from engine.training.train import TrainConfig, train

    values = {f.name: getattr(args, f.name) for f in dataclasses.fields(TrainConfig)
              if f.name not in ("extra", "train_files")}
    if args.train_files:
        values["train_files"] = tuple(args.train_files)
    train(TrainConfig(**values))
    return 0


def add_evaluate_parser(sub) -> None:
    from engine.reader.transformer_reader import QUANTIZE_CHOICES

    p = sub.add_parser("evaluate", help="score the reader on SQuAD-format data with the official SQuAD metric")
    p.add_argument("data", type=Path, help="SQuAD-format .json or .json.gz")
    p.add_argument("--limit", type=int, default=None, help="first N questions only")
    p.add_argument("--model", type=Path, default=None, help="reader folder (default: the committed reader)")
    p.add_argument("--quantize", default=None, help="one of: " + ", ".join(QUANTIZE_CHOICES))
    p.add_argument("--threshold", type=float, default=None,
                   help="no-answer margin for v2.0 data (default: the model's calibrated value)")
    p.add_argument("--json", action="store_true", help="print one JSON object")
    p.set_defaults(handler=run_evaluate)


def run_evaluate(args) -> int:
    from engine.evaluation import evaluate_file
    from engine.reader.transformer_reader import TransformerReader

    reader = TransformerReader(args.model, quantize=args.quantize)
    threshold = args.threshold
    if threshold is None:
        from engine.calibration import load_calibration

        threshold = load_calibration(reader.model_dir).null_margin_threshold
    started = time.perf_counter()
    scores, predictions = evaluate_file(reader, args.data, args.limit, threshold)
    seconds = time.perf_counter() - started
    result = {"data": str(args.data), "reader": reader.name, "threshold": threshold,
              "seconds": round(seconds, 2), "windows": reader.windows_read, **scores.as_dict()}
    if args.json:
        print(json.dumps(result))
    else:
        for key, value in result.items():
            print(f"{key:>16}: {value}")
    return 0


def add_calibrate_parser(sub) -> None:
    p = sub.add_parser("calibrate-reader",
                       help="export a trained reader and tune its quantisation, threshold, fusion and confidence on dev/")
    p.add_argument("trained", type=Path,
                   help="the training run's final/ folder (or the --out folder itself, to recalibrate it in place)")
    p.add_argument("--out", type=Path, default=None, help="model folder to write (default: the committed reader's)")
    p.add_argument("--data-dir", type=Path, default=Path("../shared/data/qa"))
    p.add_argument("--quantize", default=None,
                   help="make this variant the default path instead of the rule's pick; the variants recorded in the "
                        "folder's excerptor.json are kept, not re-measured (measured afresh if none are recorded)")
    p.set_defaults(handler=run_calibrate)


def run_calibrate(args) -> int:
    from engine.calibration import calibration_dict, write_calibration_file
    from engine.reader.transformer_reader import default_model_dir
    from engine.training.calibrate import calibrate
    from engine.training.export import export_reader

    target = args.out or default_model_dir()
    if Path(target).resolve() != Path(args.trained).resolve():
        export_reader(args.trained, target, {})  # else: recalibrate an exported reader in place
    known = recorded_variants(target) if args.quantize else None
    report = calibrate(target, args.data_dir, quantize=args.quantize, known_variants=known)
    payload = calibration_dict(report.pop("calibration"), **report)
    write_calibration_file(target, payload)
    print(json.dumps(payload, indent=2, sort_keys=True))
    return 0


def recorded_variants(model_dir: Path) -> dict | None:
    """The ``quantize_variants`` a folder's calibration file recorded, or None."""
    from engine.calibration import read_calibration_file

    return read_calibration_file(model_dir).get("quantize_variants") or None


def add_average_parser(sub) -> None:
    p = sub.add_parser("average-readers",
                       help="average the weights of two readers from a common ancestor (then run calibrate-reader)")
    p.add_argument("first", type=Path, help="reader folder (its config and tokenizer are copied)")
    p.add_argument("second", type=Path, help="reader folder with the same architecture")
    p.add_argument("--out", type=Path, required=True, help="folder to write the averaged, fp32 reader to")
    p.add_argument("--alpha", type=float, default=0.5, help="weight of the second reader (default 0.5)")
    p.set_defaults(handler=run_average)


def run_average(args) -> int:
    from engine.training.average import average_readers

    print(average_readers(args.first, args.second, args.out, args.alpha))
    return 0


if __name__ == "__main__":  # pragma: no cover
    parser = argparse.ArgumentParser(prog="excerptor")
    sub = parser.add_subparsers(dest="command", required=True)
    add_train_parser(sub)
    add_evaluate_parser(sub)
    ns = parser.parse_args()
    sys.exit(ns.handler(ns))
