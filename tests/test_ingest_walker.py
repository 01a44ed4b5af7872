"""walk_folder: candidate files, hidden/index folders, symlink loops, unreadable folders."""

from __future__ import annotations

import os

import pytest

from engine import defaults
from engine.ingest import walker
from engine.ingest.walker import walk_folder


def _touch(path, text="x"):
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(text)


@pytest.fixture
def tree(tmp_path):
    root = tmp_path / "contracts"
    for rel in [
        "lease.pdf", "B.TXT", "notes.md", "supply.DocX", "data.csv", "~$supply.docx",
        ".hidden/secret.txt", ".dotfile.txt", f"{defaults.INDEX_DIR_NAME}/cache.txt",
        "sub/c.txt", "sub/deeper/d.md",
    ]:  # fmt: skip
        _touch(root / rel)
    os.symlink(root, root / "loop")  # a link back to the root: must not be followed
    os.symlink(root / "sub", root / "sub" / "deeper" / "up")  # a loop lower down
    outside = tmp_path / "outside"
    _touch(outside / "o.txt")
    os.symlink(outside, root / "link_a")  # two links to one folder: followed once
    os.symlink(outside, root / "link_b")
    os.symlink(tmp_path / "nowhere", root / "dangling.txt")  # broken link: not a file
    return root


def test_walk_finds_candidates_sorted(tree):
    got = list(walk_folder(tree))
    rels = [rel for _, rel in got]
    # Expected list written by hand from the fixture (project rules in the walker docstring).
    assert rels == [
        "B.TXT", "lease.pdf", "link_a/o.txt", "notes.md", "sub/c.txt", "sub/deeper/d.md", "supply.DocX",
    ]  # fmt: skip
    assert rels == sorted(rels)
    for abs_path, rel in got:
        assert abs_path.is_absolute() and abs_path.is_file()
        assert abs_path == tree / rel


def test_index_dir_only_skipped_by_name(tree):
    rels = [rel for _, rel in walk_folder(tree, skip_dir_names=("sub",))]
    assert "sub/c.txt" not in rels and "lease.pdf" in rels


def test_unreadable_folder_reported(tree, monkeypatch):
    real_scandir = os.scandir

    def fake_scandir(path):
        if str(path).endswith("deeper"):
            raise PermissionError(13, "Permission denied")
        return real_scandir(path)

    monkeypatch.setattr(walker.os, "scandir", fake_scandir)
    problems = []
    rels = [rel for _, rel in walk_folder(tree, problems=problems)]
    assert "sub/c.txt" in rels and "sub/deeper/d.md" not in rels
    assert [(p.path, p.reason, p.fatal) for p in problems] == [
        ("sub/deeper", "folder could not be read (permission denied)", True)
    ]


def test_root_must_be_a_folder(tmp_path):
    with pytest.raises(ValueError):
        walk_folder(tmp_path / "missing")
