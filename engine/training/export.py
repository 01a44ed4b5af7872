"""Ship a trained reader: fp16 safetensors, config and tokenizer, plus ``excerptor.json`` (calibration)."""

from __future__ import annotations

import os
import shutil
from pathlib import Path

from engine.calibration import write_calibration_file
from engine.model_folder import packaged_encoder_dir, require_model_folder


def export_reader(trained_dir: Path, target_dir: Path, calibration: dict) -> Path:
    """Write the model in fp16 (half the bytes; loaded back as fp32) into ``target_dir``, atomically."""
    os.environ["HF_HUB_OFFLINE"] = "1"
    import torch
    from transformers import AutoModelForQuestionAnswering, AutoTokenizer

    trained_dir, target_dir = require_model_folder(trained_dir, "the trained reader folder"), Path(target_dir)
    tmp = target_dir.with_name(target_dir.name + ".tmp")
    if tmp.exists():
        shutil.rmtree(tmp)
    model = AutoModelForQuestionAnswering.from_pretrained(trained_dir, local_files_only=True, use_safetensors=True)
    model.to(torch.float16).save_pretrained(tmp, safe_serialization=True)
    tokenizer_dir = trained_dir if (trained_dir / "tokenizer.json").exists() else packaged_encoder_dir()
    AutoTokenizer.from_pretrained(tokenizer_dir, local_files_only=True).save_pretrained(tmp)
    write_calibration_file(tmp, calibration)
    if target_dir.exists():
        shutil.rmtree(target_dir)
    os.replace(tmp, target_dir)
    return target_dir
