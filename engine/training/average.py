"""Average the weights of two readers fine-tuned from a common ancestor (a two-ingredient "uniform soup").

    theta = (1 - alpha) * theta_a + alpha * theta_b, tensor by tensor (Wortsman et al., 2022, "Model soups").

Both readers must have the same tensor names and shapes (same architecture, same head). Weights are read and
written as safetensors only; the result is fp32, so ``calibrate-reader`` can export it like any trained run.
"""

from __future__ import annotations

import shutil
from pathlib import Path


def average_readers(dir_a: Path, dir_b: Path, out_dir: Path, alpha: float = 0.5) -> Path:
    """Write the weight average of two reader folders to ``out_dir`` (config and tokenizer copied from ``dir_a``)."""
    import torch
    from safetensors.torch import load_file, save_file

    if not 0.0 <= alpha <= 1.0:
        raise ValueError(f"alpha must be in [0, 1] (got {alpha})")
    a = load_file(str(Path(dir_a) / "model.safetensors"))
    b = load_file(str(Path(dir_b) / "model.safetensors"))
    if a.keys() != b.keys() or any(a[k].shape != b[k].shape for k in a):
        raise ValueError(f"the readers differ in tensor names or shapes (got {dir_a} and {dir_b})")
    merged = {k: ((1.0 - alpha) * a[k].float() + alpha * b[k].float()).contiguous() for k in sorted(a)}
    out_dir = Path(out_dir)
    out_dir.mkdir(parents=True, exist_ok=True)
    save_file(merged, str(out_dir / "model.safetensors"), metadata={"format": "pt"})
    for name in ("config.json", "tokenizer.json", "tokenizer_config.json", "special_tokens_map.json", "vocab.txt"):
        if (Path(dir_a) / name).exists():
            shutil.copy(Path(dir_a) / name, out_dir / name)
    return out_dir
