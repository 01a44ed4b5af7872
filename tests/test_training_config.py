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


def test_cli_default_is_auto():
    parser = argparse.ArgumentParser()
    add_train_parser(parser.add_subparsers(dest="command"))
    assert parser.parse_args(["train-reader"]).bf16 == "auto"
    assert parser.parse_args(["train-reader", "--bf16", "false"]).bf16 == "false"
