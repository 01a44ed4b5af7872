"""A few real optimiser steps of the training command, from the packaged MiniLM encoder, with weighted negatives."""

import math
import re

import pytest

from engine.training.train import TrainConfig, train
from tests.training_files import write_general_file


def test_training_steps_write_a_reader_and_resume(tmp_path):
    config = dict(data_dir=str(tmp_path), out_dir=str(tmp_path / "run"), train_files=(write_general_file(tmp_path),),
                  synthetic_windows=0, same_title_negative_rate=0.5, general_negative_loss_weight=2.0,
                  batch_size=8, max_steps=2, checkpoint_every=2, eval_every=0, log_every=1, bf16="false", seed=3)
    final = train(TrainConfig(**config))
    assert (final / "model.safetensors").is_file() and (final / "tokenizer.json").is_file()
    log = (tmp_path / "run" / "train.log").read_text(encoding="utf-8")
    losses = [float(x) for x in re.findall(r"step \d+/2 loss ([0-9.]+)", log)]
    # An untrained head scores about ln(window length) per window (uniform logits); finite and positive here.
    assert len(losses) == 2 and all(0.0 < x < 2 * math.log(256) for x in losses)
    config["max_steps"] = 3
    train(TrainConfig(**config))
    log = (tmp_path / "run" / "train.log").read_text(encoding="utf-8")
    assert "resumed at step 2" in log and re.search(r"step 3/3 loss [0-9.]+", log)


def test_a_missing_init_dir_fails_with_its_name_before_anything_is_written(tmp_path, capsys):
    from engine.cli import main

    missing = tmp_path / "no-such-reader"
    with pytest.raises(FileNotFoundError, match="no-such-reader"):
        train(TrainConfig(data_dir=str(tmp_path), out_dir=str(tmp_path / "run"), init_dir=str(missing)))
    assert not (tmp_path / "run").exists()
    # The command says so in one line instead of a library traceback about an online lookup.
    assert main(["train-reader", "--out-dir", str(tmp_path / "run2"), "--init-dir", str(missing)]) == 2
    err = capsys.readouterr().err
    assert "--init-dir" in err and str(missing) in err and "Traceback" not in err
    assert not (tmp_path / "run2").exists()


def test_calibrate_reader_names_a_missing_trained_folder_and_writes_nothing(tmp_path, capsys):
    from engine.cli import main

    missing, target = tmp_path / "no-such-run", tmp_path / "reader-out"
    assert main(["calibrate-reader", str(missing), "--out", str(target)]) == 2
    err = capsys.readouterr().err
    assert str(missing) in err and "config.json" in err and "Traceback" not in err
    assert not target.exists() and not target.with_name(target.name + ".tmp").exists()


def test_calibrate_reader_in_place_keeps_the_weights_and_replaces_only_the_calibration(tmp_path, monkeypatch, capsys):
    import json

    import engine.training.calibrate
    import engine.training.export
    from engine.calibration import Calibration, load_calibration
    from engine.cli import main

    folder = tmp_path / "reader"
    folder.mkdir()
    (folder / "config.json").write_text("{}", encoding="utf-8")
    (folder / "excerptor.json").write_text(json.dumps({"null_margin_threshold": 9.0}), encoding="utf-8")

    def no_export(*_args, **_kwargs):
        raise AssertionError("an in-place recalibration must not re-export (and so rewrite) the weights")

    fitted = Calibration(null_margin_threshold=1.5, fusion_weight=0.2, default_quantize="attention")
    monkeypatch.setattr(engine.training.export, "export_reader", no_export)
    calls = []

    def fake_calibrate(target, data_dir, **options):
        calls.append(options)
        return {"calibration": fitted, "dev_mix_size": 3, "quantize_variants": {"none": {"dev_f1": 66.0}}}

    monkeypatch.setattr(engine.training.calibrate, "calibrate", fake_calibrate)
    assert main(["calibrate-reader", str(folder), "--out", str(folder)]) == 0
    assert load_calibration(folder) == fitted
    assert json.loads((folder / "excerptor.json").read_text(encoding="utf-8"))["dev_mix_size"] == 3
    assert sorted(p.name for p in folder.iterdir()) == ["config.json", "excerptor.json"]  # no temporary file left
    # A given path keeps the variants the folder recorded instead of measuring them again.
    assert main(["calibrate-reader", str(folder), "--out", str(folder), "--quantize", "all-per-token"]) == 0
    assert calls == [{"quantize": None, "known_variants": None},
                     {"quantize": "all-per-token", "known_variants": {"none": {"dev_f1": 66.0}}}]
    capsys.readouterr()


def test_training_through_fake_int8_saves_a_plain_reader(tmp_path):
    from safetensors import safe_open

    config = dict(data_dir=str(tmp_path), out_dir=str(tmp_path / "run"), train_files=(write_general_file(tmp_path),),
                  synthetic_windows=0, batch_size=8, max_steps=1, checkpoint_every=1, eval_every=0, log_every=1,
                  bf16="false", seed=3, fake_quant="all-per-channel")
    final = train(TrainConfig(**config))
    log = (tmp_path / "run" / "train.log").read_text(encoding="utf-8")
    assert "fake int8 on 36 layers (all-per-channel)" in log  # 6 layers x 6 Linear; the span head stays fp32
    assert re.search(r"step 1/1 loss [0-9.]+", log)
    with safe_open(final / "model.safetensors", framework="pt") as weights:
        names = set(weights.keys())
    assert "bert.encoder.layer.0.attention.self.query.weight" in names
    assert not any("fake" in n or "original" in n for n in names)


def test_an_unknown_fake_quant_mode_fails_before_anything_is_written(tmp_path):
    with pytest.raises(ValueError, match=r"got 'int4'"):
        train(TrainConfig(data_dir=str(tmp_path), out_dir=str(tmp_path / "run"), fake_quant="int4"))
    assert not (tmp_path / "run").exists()


def test_the_evaluation_between_steps_scores_a_model_as_the_fp32_reader_does():
    """quick_dev_eval wraps the model in training; on the committed weights it must match TransformerReader in fp32.

    Both use the official SQuAD v1.1 metric (engine.metrics, checked against torchmetrics in test_metrics.py)."""
    from engine.evaluation import predict_examples
    from engine.metrics import score_v1
    from engine.reader.transformer_reader import TransformerReader
    from engine.squad_data import load_examples
    from engine.training.train import quick_dev_eval
    from tests.shared_data import SHARED_QA, reader_dir, shared_file

    tydi = shared_file("dev/tydiqa_goldp_en_dev.json.gz")
    reader = TransformerReader(reader_dir(), quantize="none")
    in_training = quick_dev_eval(reader.model, reader.tokenizer, TrainConfig(data_dir=str(SHARED_QA)), limit=20)
    examples = load_examples(tydi, limit=20)
    predictions = predict_examples(reader, examples, threshold=None)
    golds = {e.qid: [a.text for a in e.answers] for e in examples}
    assert in_training == score_v1({k: v.text for k, v in predictions.items()}, golds).as_dict()
    assert in_training["f1"] > 40.0  # a trained reader (v8 scores 65.97 on all 440; no source for the floor)
