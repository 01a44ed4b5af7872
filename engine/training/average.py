"""Average the weights of readers fine-tuned from a common ancestor ("model soups").

    theta = (1 - alpha) * theta_a + alpha * theta_b, tensor by tensor (Wortsman et al., 2022, "Model soups"),
    and the k-ingredient uniform soup theta = (theta_1 + ... + theta_k) / k.

Both readers must have the same tensor names and shapes (same architecture, same head). Weights are read and
written as safetensors only; the result is fp32, so ``calibrate-reader`` can export it like any trained run.
"""

from __future__ import annotations

import shutil
from pathlib import Path


def _copy_reader_files(source: Path, out_dir: Path) -> None:
    for name in ("config.json", "tokenizer.json", "tokenizer_config.json", "special_tokens_map.json", "vocab.txt"):
        if (Path(source) / name).exists():
            shutil.copy(Path(source) / name, out_dir / name)


def weighted_average(dirs: list[Path], weights: list[float], out_dir: Path) -> Path:
    """Write sum_i w_i * theta_i over the reader folders to ``out_dir`` (config and tokenizer from the first).

    Summed in float64 and stored as float32; every folder must hold the same tensor names and shapes.
    """
    import torch
    from safetensors.torch import load_file, save_file

    if len(dirs) != len(weights) or len(dirs) < 2:
        raise ValueError(f"an average needs at least two readers, one weight each (got {len(dirs)} and {len(weights)})")
    total: dict[str, torch.Tensor] = {}
    for folder, weight in zip(dirs, weights):
        tensors = load_file(str(Path(folder) / "model.safetensors"))
        if total and (tensors.keys() != total.keys() or any(tensors[k].shape != total[k].shape for k in total)):
            raise ValueError(f"the readers differ in tensor names or shapes (got {dirs[0]} and {folder})")
        for key, tensor in tensors.items():
            part = weight * tensor.double()
            total[key] = total[key] + part if key in total else part
    out_dir = Path(out_dir)
    out_dir.mkdir(parents=True, exist_ok=True)
    merged = {k: total[k].float().contiguous() for k in sorted(total)}
    save_file(merged, str(out_dir / "model.safetensors"), metadata={"format": "pt"})
    _copy_reader_files(dirs[0], out_dir)
    return out_dir


def uniform_soup(dirs: list[Path], out_dir: Path) -> Path:
    """Write the mean of k >= 2 reader folders' weights to ``out_dir`` (config and tokenizer from the first)."""
    if len(dirs) < 2:
        raise ValueError(f"a soup needs at least two readers (got {len(dirs)})")
    return weighted_average(list(dirs), [1.0 / len(dirs)] * len(dirs), out_dir)


def average_readers(dir_a: Path, dir_b: Path, out_dir: Path, alpha: float = 0.5) -> Path:
    """Write the weight average of two reader folders to ``out_dir`` (config and tokenizer copied from ``dir_a``)."""
    if not 0.0 <= alpha <= 1.0:
        raise ValueError(f"alpha must be in [0, 1] (got {alpha})")
    return weighted_average([Path(dir_a), Path(dir_b)], [1.0 - alpha, alpha], out_dir)
