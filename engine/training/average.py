"""Average the weights of two readers fine-tuned from a common ancestor (a two-ingredient "uniform soup").

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


def uniform_soup(dirs: list[Path], out_dir: Path) -> Path:
    """Write the mean of k >= 2 reader folders' weights to ``out_dir`` (config and tokenizer from the first)."""
    import torch
    from safetensors.torch import load_file, save_file

    if len(dirs) < 2:
        raise ValueError(f"a soup needs at least two readers (got {len(dirs)})")
    total: dict[str, torch.Tensor] = {}
    for folder in dirs:
        weights = load_file(str(Path(folder) / "model.safetensors"))
        if total and (weights.keys() != total.keys() or any(weights[k].shape != total[k].shape for k in total)):
            raise ValueError(f"the readers differ in tensor names or shapes (got {dirs[0]} and {folder})")
        for key, tensor in weights.items():
            total[key] = total[key] + tensor.double() if key in total else tensor.double()
    merged = {k: (total[k] / len(dirs)).float().contiguous() for k in sorted(total)}
    out_dir = Path(out_dir)
    out_dir.mkdir(parents=True, exist_ok=True)
    save_file(merged, str(out_dir / "model.safetensors"), metadata={"format": "pt"})
    _copy_reader_files(dirs[0], out_dir)
    return out_dir


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
    _copy_reader_files(dir_a, out_dir)
    return out_dir
