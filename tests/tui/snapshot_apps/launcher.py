"""Builds the app for the snapshot tests: a temporary copy of demo_docs (index in its .excerptor folder), the
fake reader, and nothing on screen that changes between runs (no times, durations or absolute paths)."""

from __future__ import annotations

import atexit
import shutil
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[3]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

from tests.tui.tui_harness import build_app, demo_copy, fake_workspace  # noqa: E402


def build(swept: bool = False, abstaining: bool = False):
    """The app over a fresh copy; ``swept``: the default checklist already swept (for the grid); ``abstaining``: a
    calibration under which every question abstains (to show the closest spans below the threshold)."""
    home = Path(tempfile.mkdtemp(prefix="excerptor-snap-"))
    atexit.register(shutil.rmtree, home, True)
    folder = demo_copy(home)
    if abstaining:
        from dataclasses import replace

        from engine.workspace import Workspace
        from tests.fakes import FAKE_CALIBRATION, FakeReader

        strict = replace(FAKE_CALIBRATION, null_margin_threshold=-100.0)
        return build_app(folder, export_dir=home, workspace=Workspace(folder, reader=FakeReader(), calibration=strict))
    if swept:
        from engine.checklist import load_checklist
        from engine.sweep import run_sweep
        from tui.app import DEFAULT_CHECKLIST

        workspace = fake_workspace(folder)
        run_sweep(workspace, load_checklist(DEFAULT_CHECKLIST))
        workspace.close()
    return build_app(folder, export_dir=home)
