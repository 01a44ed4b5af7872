"""Measure, on training windows only, the per-channel input means that bias-corrected int8 paths need
(engine.reader.bias_correction), and store them in the reader folder."""

from __future__ import annotations

import os
import random
from pathlib import Path

import numpy as np

from engine.reader.bias_correction import measure_input_means, save_input_means
from engine.reader.windows import build_windows
from engine.squad_data import load_examples

# Questions sampled from each train/ file; the first window of each is read. A common-practice calibration size
# with no source.
MEAN_QUESTIONS_PER_FILE = 64


def mean_windows(tokenizer, data_dir: Path, seed: int = 7,
                  per_file: int = MEAN_QUESTIONS_PER_FILE) -> list[dict[str, np.ndarray]]:
    """The first window of ``per_file`` questions drawn (``random.Random(seed)``) from every train/*.json.gz file,
    as unpadded model inputs. Never reads dev/ or test/."""
    files = sorted((Path(data_dir) / "train").glob("*.json.gz"))
    if not files:
        raise FileNotFoundError(f"no training files to measure input means on (looked in {data_dir}/train)")
    rng = random.Random(seed)
    encoded = []
    for path in files:
        examples = load_examples(path)
        chosen = rng.sample(examples, min(per_file, len(examples)))
        first = {}
        for window in build_windows(tokenizer, [(e.question, e.context) for e in chosen]):
            first.setdefault(window.pair_index, window)
        for window in first.values():
            ids = np.array(window.input_ids, dtype=np.int64)
            encoded.append({"input_ids": ids, "token_type_ids": np.array(window.token_type_ids, dtype=np.int64),
                            "attention_mask": np.ones_like(ids)})
    return encoded


def write_input_means(model_dir: Path, data_dir: Path, seed: int = 7) -> Path:
    """Load the reader in fp32 (as TransformerReader does), measure E[x] per input channel of every encoder Linear on
    ``mean_windows`` and write them beside its weights."""
    os.environ["HF_HUB_OFFLINE"] = "1"
    import torch
    from transformers import AutoModelForQuestionAnswering, AutoTokenizer

    tokenizer = AutoTokenizer.from_pretrained(model_dir, local_files_only=True)
    model = AutoModelForQuestionAnswering.from_pretrained(
        model_dir, local_files_only=True, use_safetensors=True, dtype=torch.float32).eval()
    means = measure_input_means(model, mean_windows(tokenizer, data_dir, seed))
    return save_input_means(means, model_dir)
