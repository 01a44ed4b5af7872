"""Shared helpers for the TUI tests: a fresh copy of demo_docs, the fake reader, and waiting for workers."""

from __future__ import annotations

import asyncio
import atexit
import contextlib
import functools
import shutil
import tempfile
from pathlib import Path

from engine.workspace import Workspace
from tests.fakes import FAKE_CALIBRATION, FakeReader
from tui.app import ExcerptorApp

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "demo_docs"
SIZE = (120, 40)
GOVERNING_LAW = "What is the governing law of the land lease?"


def run_async(test):
    """Run an ``async def`` test with asyncio (the suite has no async pytest plugin)."""

    @functools.wraps(test)
    def wrapper(*args, **kwargs):
        return asyncio.run(test(*args, **kwargs))

    return wrapper


_indexed_template: list[Path] = []


def demo_copy(base: Path, indexed: bool = True) -> Path:
    """A copy of demo_docs at ``base/demo_docs``; its index lives in ``.excerptor`` inside it.

    ``indexed``: copy a folder indexed once per test session (file times kept, so the app's refresh finds every
    file unchanged and the tests do not parse the PDFs again).
    """
    folder = Path(base) / "demo_docs"
    if not indexed:
        shutil.copytree(DEMO, folder, ignore=shutil.ignore_patterns(".excerptor"))
        return folder
    if not _indexed_template:
        from engine.indexer import refresh_index

        home = Path(tempfile.mkdtemp(prefix="excerptor-tui-"))
        atexit.register(shutil.rmtree, home, True)
        template = home / "demo_docs"
        shutil.copytree(DEMO, template, ignore=shutil.ignore_patterns(".excerptor"))
        refresh_index(template)
        _indexed_template.append(template)
    shutil.copytree(_indexed_template[0], folder)
    return folder


def fake_workspace(folder: Path) -> Workspace:
    return Workspace(folder, reader=FakeReader(), calibration=FAKE_CALIBRATION)


def build_app(folder: Path, **kwargs) -> ExcerptorApp:
    """The real app over ``folder`` with the fake reader injected (no model is loaded)."""
    kwargs.setdefault("export_dir", Path(folder).parent)
    if "workspace" not in kwargs and "workspace_factory" not in kwargs:
        kwargs["workspace"] = fake_workspace(folder)
    return ExcerptorApp(folder, **kwargs)


@contextlib.asynccontextmanager
async def running_app(folder: Path, **kwargs):
    """``build_app(folder, **kwargs)`` running under Pilot at SIZE, settled after start-up; yields (app, pilot)."""
    app = build_app(folder, **kwargs)
    async with app.run_test(size=SIZE) as pilot:
        await settle(pilot)
        yield app, pilot


async def settle(pilot, rounds: int = 5) -> None:
    """Let the workers finish and the screen catch up with the messages they posted (which may start more)."""
    for _ in range(rounds):
        await pilot.pause()
        # Not the export dialog flow: it waits for the user, by design.
        busy = [w for w in pilot.app.workers if w.group != "export" and not w.is_finished]
        if not busy:
            break
        await pilot.app.workers.wait_for_complete(busy)
    await pilot.pause()


async def ask(pilot, question: str, typed: int = 0) -> None:
    """Put a question in the question box (its last ``typed`` characters typed key by key), press Enter and wait
    for the answers. (Each simulated key press costs a screen refresh, so tests type only a few.)"""
    from textual.widgets import Input

    box = pilot.app.desk.query_one(Input)
    box.focus()
    box.value = ""
    await pilot.pause()
    cut = len(question) - typed
    box.value = question[:cut]
    box.cursor_position = cut
    await pilot.press(*question[cut:])
    await pilot.press("enter")
    await settle(pilot)
