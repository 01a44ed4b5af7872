"""No network at run time: index, ask, sweep, export and the real reader run under a socket guard, and a static
scan finds no download call, no unsafe deserialisation and no HTTP client in engine/ or tui/.

The guard (tests/conftest.py ``no_network``) fails the test on any connect / create_connection / getaddrinfo to
a non-loopback address (loopback per RFC 1122 and RFC 4291), even if the code under test swallows the error.
"""

from __future__ import annotations

import ast
import importlib.util
import json
import os
import shutil
import socket
from pathlib import Path

import pytest

from engine import defaults
from engine.indexer import open_index, refresh_index
from engine.types import AskResult
from engine.workspace import Workspace
from tests.fakes import FAKE_CALIBRATION, FakeReader

REPO = Path(__file__).resolve().parents[1]
MODEL_DIR = REPO / defaults.READER_MODEL_DIR
DEMO_QUESTION = json.loads((REPO / "tests" / "data" / "demo_questions.jsonl").read_text().splitlines()[0])


@pytest.fixture
def demo_folder(tmp_path) -> Path:
    folder = tmp_path / "demo"
    shutil.copytree(REPO / "demo_docs", folder, ignore=shutil.ignore_patterns(".excerptor"))
    return folder


def test_guard_blocks_remote_and_allows_loopback(no_network):
    with pytest.raises(AssertionError, match="network access attempted"):
        socket.getaddrinfo("example.org", 443)  # RFC 2606 reserved name: never a real service
    with pytest.raises(AssertionError, match="network access attempted"):
        socket.create_connection(("192.0.2.1", 80), timeout=0.1)  # RFC 5737 TEST-NET-1
    with socket.socket() as s:
        with pytest.raises(AssertionError, match="network access attempted"):
            s.connect(("198.51.100.7", 443))  # RFC 5737 TEST-NET-2
    no_network.clear()  # the attempts above were the point of this test
    assert socket.getaddrinfo("localhost", 80)  # loopback stays allowed
    with socket.socket() as server:
        server.bind(("127.0.0.1", 0))
        server.listen(1)
        with socket.create_connection(server.getsockname(), timeout=1):
            pass


def test_index_and_ask_offline(no_network, demo_folder):
    report = refresh_index(demo_folder)
    assert not report.failed and len(report.indexed) == 5
    with open_index(demo_folder) as index:
        assert index.search("landlord", k=3)
    workspace = Workspace(demo_folder, reader=FakeReader(), calibration=FAKE_CALIBRATION)
    try:
        result = workspace.ask(DEMO_QUESTION["question"])
    finally:
        workspace.close()
    assert isinstance(result, AskResult) and result.question == DEMO_QUESTION["question"]


def _use_fake_reader(monkeypatch) -> None:
    import engine.workspace

    monkeypatch.setattr(engine.workspace, "load_default_reader", lambda quantize=None: (FakeReader(), FAKE_CALIBRATION))


@pytest.mark.skipif(importlib.util.find_spec("engine.sweep") is None, reason="engine/sweep.py is not built yet")
def test_sweep_and_export_offline(no_network, demo_folder, monkeypatch, tmp_path, capsys):
    from engine import cli

    _use_fake_reader(monkeypatch)
    checklist = REPO / "checklists" / "commercial.checklist"
    grid = tmp_path / "grid.xlsx"
    # Command lines as documented in README.md ("excerptor sweep FOLDER --checklist ... [--out grid.xlsx]",
    # "excerptor export FOLDER --format csv|jsonl|md|xlsx --out PATH").
    assert cli.main(["sweep", str(demo_folder), "--checklist", str(checklist), "--out", str(grid)]) == 0
    assert grid.is_file()
    if importlib.util.find_spec("engine.cli_review") is None:
        pytest.skip("engine/cli_review.py (the export command) is not built yet")
    for fmt in ("csv", "jsonl", "md", "xlsx"):
        out = tmp_path / f"log.{fmt}"
        assert cli.main(["export", str(demo_folder), "--format", fmt, "--out", str(out)]) == 0, fmt
        assert out.is_file() and out.stat().st_size > 0
    assert "Traceback" not in capsys.readouterr().err


@pytest.mark.real_model
@pytest.mark.skipif(not (MODEL_DIR / "config.json").is_file(),
                    reason=f"{defaults.READER_MODEL_DIR}/config.json is missing: the committed reader is not there yet")
def test_real_reader_offline(no_network, demo_folder, monkeypatch):
    from engine.calibration import load_calibration
    from engine.reader.transformer_reader import TransformerReader

    monkeypatch.delenv("HF_HUB_OFFLINE", raising=False)  # restored after the test; the reader must set it
    monkeypatch.delenv("TRANSFORMERS_OFFLINE", raising=False)
    reader = TransformerReader(MODEL_DIR, threads=1)
    assert os.environ.get("HF_HUB_OFFLINE") == "1"
    refresh_index(demo_folder)
    workspace = Workspace(demo_folder, reader=reader, calibration=load_calibration(MODEL_DIR))
    try:
        result = workspace.ask(DEMO_QUESTION["question"], top_n=3)
        for answer in result.answers:
            page = workspace.index.store.get_page_text(answer.citation.file, answer.citation.page,
                                                       answer.citation.locator)
            assert page[answer.citation.start : answer.citation.end] == answer.text  # engine/types.py invariant
    finally:
        workspace.close()
    assert os.environ.get("HF_HUB_OFFLINE") == "1"


# -- static scan ---------------------------------------------------------------------------------------------

NETWORK_MODULES = {"requests", "urllib.request", "urllib3", "httpx", "http.client", "aiohttp"}
DOWNLOADERS = {"hf_hub_download", "snapshot_download"}


def _dotted(node: ast.AST) -> str:
    if isinstance(node, ast.Name):
        return node.id
    if isinstance(node, ast.Attribute):
        return f"{_dotted(node.value)}.{node.attr}"
    return "?"


def _kw_true(call: ast.Call, name: str) -> bool:
    return any(k.arg == name and isinstance(k.value, ast.Constant) and k.value.value is True for k in call.keywords)


def offline_violations(source: str, where: str = "<string>") -> list[str]:
    """Lines of ``source`` that could reach the network or deserialise unsafely (see the module docstring)."""
    found = []
    for node in ast.walk(ast.parse(source)):
        line = f"{where}:{getattr(node, 'lineno', 0)}"
        if isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name in NETWORK_MODULES or alias.name.split(".")[0] == "requests":
                    found.append(f"{line}: import {alias.name}")
        elif isinstance(node, ast.ImportFrom):
            module = node.module or ""
            names = {a.name for a in node.names}
            if module in NETWORK_MODULES or module.split(".")[0] == "requests" or (module == "urllib" and "request" in names):
                found.append(f"{line}: from {module} import ...")
            if module == "pickle" and names & {"load", "loads", "Unpickler"}:
                found.append(f"{line}: from pickle import load")
            if module == "nltk" and "download" in names:
                found.append(f"{line}: from nltk import download")
            if names & DOWNLOADERS:
                found.append(f"{line}: imports a hub downloader")
        elif isinstance(node, ast.Attribute) and node.attr in DOWNLOADERS:
            found.append(f"{line}: {node.attr}")
        elif isinstance(node, ast.Call):
            name = _dotted(node.func)
            if name in ("pickle.load", "pickle.loads", "pickle.Unpickler", "joblib.load", "dill.load", "dill.loads"):
                found.append(f"{line}: {name}()")
            elif name == "torch.load" and not _kw_true(node, "weights_only"):
                found.append(f"{line}: torch.load() without weights_only=True")
            elif name in ("nltk.download", "urllib.request.urlopen", "urlopen"):
                found.append(f"{line}: {name}()")
            elif name.endswith(("np.load", "numpy.load")) and _kw_true(node, "allow_pickle"):
                found.append(f"{line}: {name}(allow_pickle=True)")
            elif name.endswith(".from_pretrained") and not _kw_true(node, "local_files_only"):
                found.append(f"{line}: {name}() without local_files_only=True")
            elif name in DOWNLOADERS:
                found.append(f"{line}: {name}()")
    return found


def test_static_scan_catches_each_pattern():
    bad = """
import requests
import urllib.request
from urllib import request
import pickle
pickle.loads(b"")
from pickle import load
torch.load("w.pt")
torch.load("w.pt", weights_only=False)
nltk.download("punkt")
from huggingface_hub import snapshot_download
huggingface_hub.hf_hub_download("x", "y")
np.load("a.npz", allow_pickle=True)
AutoModel.from_pretrained("some/model")
"""
    assert len(offline_violations(bad)) == 12
    good = """
torch.load("w.pt", weights_only=True)
np.load("a.npz", allow_pickle=False)
AutoModel.from_pretrained(path, local_files_only=True)
"""
    assert offline_violations(good) == []


def test_engine_and_tui_have_no_network_or_unsafe_loading():
    files = sorted([*(REPO / "engine").rglob("*.py"), *(REPO / "tui").rglob("*.py")])
    assert len(files) > 20
    found = []
    for path in files:
        found += offline_violations(path.read_text(encoding="utf-8"), str(path.relative_to(REPO)))
    assert found == []
