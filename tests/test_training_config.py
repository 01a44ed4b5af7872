"""The bf16 switch of the training command (a project rule with no outside source: use bf16 autocast only
where the CPU computes bf16 natively; the speeds behind it were measured here and are noted in use_bf16)."""

import argparse

import pytest

from engine.cli_train import add_train_parser
from engine.training.train import use_bf16


def test_explicit_settings_win_over_the_cpu_check():
    assert use_bf16("true", native=False) is True
    assert use_bf16("false", native=True) is False


def test_auto_follows_native_bf16_support():
    assert use_bf16("auto", native=True) is True
    assert use_bf16("auto", native=False) is False


def test_bad_setting_names_the_value():
    with pytest.raises(ValueError, match=r"got 'yes'"):
        use_bf16("yes")


def train_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser()
    add_train_parser(parser.add_subparsers(dest="command"))
    return parser


def test_cli_default_is_auto():
    parser = train_parser()
    assert parser.parse_args(["train-reader"]).bf16 == "auto"
    assert parser.parse_args(["train-reader", "--bf16", "false"]).bf16 == "false"


def test_training_device_is_cpu_or_a_visible_gpu():
    import torch

    from engine.training.train import training_device

    assert training_device("cpu") == "cpu"
    with pytest.raises(ValueError, match=r"got 'gpu'"):
        training_device("gpu")
    if not torch.cuda.is_available():  # the CPU build the project pins sees no GPU
        with pytest.raises(ValueError, match=r"needs a CUDA build"):
            training_device("cuda")


def test_cli_trains_on_cpu_unless_told():
    assert train_parser().parse_args(["train-reader"]).device == "cpu"


def test_seed_soup_sets_seed_and_folder_itself(tmp_path):
    import sys
    from pathlib import Path

    sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "scripts"))
    from seed_soup import train_commands

    commands = train_commands(tmp_path, [5, 7], ["--max-steps", "3"])
    assert commands[7][-5:] == [str(tmp_path / "seed7"), "--seed", "7", "--max-steps", "3"]
    with pytest.raises(ValueError, match=r"got --seed"):
        train_commands(tmp_path, [5, 7], ["--seed", "1"])
    with pytest.raises(ValueError, match=r"got \[5, 5\]"):
        train_commands(tmp_path, [5, 5], [])
