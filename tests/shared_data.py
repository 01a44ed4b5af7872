"""Where the shared QA data sets live, and how tests that need them skip (or fail in CI)."""

from __future__ import annotations

import os
from pathlib import Path

import pytest

from engine import defaults

SHARED_QA = Path(__file__).resolve().parents[1].parent / "shared" / "data" / "qa"


def shared_file(relative: str) -> Path:
    """The path of a shared data file; skips the test when absent, fails when CI requires the data."""
    path = SHARED_QA / relative
    if path.exists():
        return path
    message = f"needs {path} (the shared QA data folder beside the repository is missing)"
    if os.environ.get("EXCERPTOR_REQUIRE_SHARED") == "1":
        pytest.fail(message + "; EXCERPTOR_REQUIRE_SHARED=1 makes it required")
    pytest.skip(message)


def reader_dir() -> Path:
    """The committed reader folder; skips when it is not there (fails in CI, where it must be)."""
    path = Path(__file__).resolve().parents[1] / defaults.READER_MODEL_DIR
    if (path / "config.json").exists():
        return path
    message = f"needs the committed reader in {path}"
    if os.environ.get("EXCERPTOR_REQUIRE_SHARED") == "1":
        pytest.fail(message)
    pytest.skip(message)
