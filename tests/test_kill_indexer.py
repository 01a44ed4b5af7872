"""kill -9 the indexer at random moments: the index always opens and searches, and a clean run completes the job.

A "zygote" subprocess (the venv's python) imports the engine once; for each round it forks a child that runs
``refresh_index`` and the test SIGKILLs that child after a seeded random delay. Between rounds files are
edited, added and deleted. After each kill the index must open, pass SQLite's integrity check, hold for every
file either a version written since the last completed run or nothing (never a torn mix), keep the stored
invariant ``passage.text == page.text[start:end]`` (engine/types.py), and answer a search. Finally a clean run
must leave an index equal to a fresh full index of the same files (same documents, hashes and passage texts).
SIGKILL cannot be caught (POSIX signal.h), so nothing in the child gets a chance to clean up.
"""

from __future__ import annotations

import hashlib
import os
import random
import select
import shutil
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest
from fpdf import FPDF

from engine import defaults
from engine.indexer import index_dir, open_index, refresh_index

SEED = 20240611
MIN_KILLS = 20
MAX_ROUNDS = 60
REPO = Path(__file__).resolve().parents[1]

_ZYGOTE = r"""
import os, sys, traceback
from engine.indexer import refresh_index
import engine.sentences, engine.passages, engine.ingest.parse
engine.sentences._tokenizer()
print("ready", flush=True)
for line in sys.stdin:
    folder = line.strip()
    pid = os.fork()
    if pid == 0:
        code = 0
        try:
            refresh_index(folder)
        except BaseException:
            traceback.print_exc()
            code = 3
        os._exit(code)
    print("pid", pid, flush=True)
    _, status = os.waitpid(pid, 0)
    print("exit", status, flush=True)
"""

WORDS = ("tenant landlord supplier buyer licensee premises goods software fee rent deposit warranty notice "
         "termination renewal indemnity insurance audit escrow royalty delivery invoice interest breach "
         "confidential arbitration").split()  # invented contract vocabulary


def _text(rng: random.Random, label: str) -> str:
    sentences = []
    for i in range(rng.randint(6, 14)):
        body = " ".join(rng.choice(WORDS) for _ in range(rng.randint(8, 16)))
        sentences.append(f"{i + 1}. The {label} clause says the {body} within {rng.randint(5, 90)} days.")
    return "\n\n".join(sentences)


def _pdf(text: str) -> bytes:
    pdf = FPDF()
    pdf.set_font("Helvetica", size=10)  # core font: latin-1 only (fpdf2 documentation)
    pdf.add_page()
    pdf.multi_cell(0, 5, text)
    return bytes(pdf.output())


class Folder:
    """The contract folder and, per file, the SHA-256 of every version written since the last completed run."""

    def __init__(self, root: Path, rng: random.Random) -> None:
        self.root, self.rng, self.serial = root, rng, 0
        self.acceptable: dict[str, set[str | None]] = {}

    def current(self) -> dict[str, str]:
        out = {}
        for p in self.root.rglob("*"):
            rel = p.relative_to(self.root).as_posix()
            if p.is_file() and not rel.startswith(defaults.INDEX_DIR_NAME + "/"):
                out[rel] = hashlib.sha256(p.read_bytes()).hexdigest()
        return out

    def write(self, rel: str) -> None:
        self.serial += 1
        text = _text(self.rng, f"{Path(rel).stem} v{self.serial}")
        data = _pdf(text) if rel.endswith(".pdf") else text.encode("utf-8")
        path = self.root / rel
        path.parent.mkdir(parents=True, exist_ok=True)
        old = path.stat().st_mtime_ns if path.exists() else time.time_ns()
        path.write_bytes(data)
        os.utime(path, ns=(old + 10**9, old + 10**9))  # a new mtime even on a coarse-clock file system
        self.acceptable.setdefault(rel, {None}).add(hashlib.sha256(data).hexdigest())

    def delete(self, rel: str) -> None:
        (self.root / rel).unlink()
        self.acceptable.setdefault(rel, set()).add(None)

    def settle(self) -> None:
        """A run completed: only the files as they are now are acceptable."""
        now = self.current()
        self.acceptable = {rel: {now.get(rel)} for rel in set(self.acceptable) | set(now)}

    def mutate(self) -> None:
        files = sorted(self.current())
        rng = self.rng
        for rel in rng.sample(files, k=min(len(files), rng.randint(1, 8))):
            self.write(rel)
        for _ in range(rng.randint(0, 2)):
            self.serial += 1
            ext = rng.choice([".txt", ".txt", ".pdf"])
            self.write(f"{rng.choice(['leases', 'supply', 'misc'])}/new_{self.serial}{ext}")
        files = sorted(self.current())
        for rel in rng.sample(files, k=rng.randint(0, max(0, min(2, len(files) - 20)))):
            self.delete(rel)
        if rng.random() < 0.25:  # touch without change: same bytes, new mtime (the hash-compare path)
            rel = rng.choice(sorted(self.current()))
            st = (self.root / rel).stat()
            os.utime(self.root / rel, ns=(st.st_atime_ns, st.st_mtime_ns + 10**9))


class Zygote:
    def __init__(self) -> None:
        env = {**os.environ, "PYTHONPATH": str(REPO), "OPENBLAS_NUM_THREADS": "1", "OMP_NUM_THREADS": "1"}
        self.proc = subprocess.Popen([sys.executable, "-c", _ZYGOTE], cwd=REPO, env=env, text=True, bufsize=1,
                                     stdin=subprocess.PIPE, stdout=subprocess.PIPE)
        assert self._line(60) == "ready"

    def _line(self, timeout: float) -> str:
        ready, _, _ = select.select([self.proc.stdout], [], [], timeout)
        assert ready, "the indexer subprocess did not answer"
        return self.proc.stdout.readline().strip()

    def run(self, folder: Path, kill_after: float | None) -> tuple[bool, float]:
        """Run one refresh in a forked child; SIGKILL it after ``kill_after`` s. Returns (was killed, seconds)."""
        self.proc.stdin.write(f"{folder}\n")
        self.proc.stdin.flush()
        word, pid = self._line(30).split()
        assert word == "pid"
        started = time.monotonic()
        if kill_after is not None:
            ready, _, _ = select.select([self.proc.stdout], [], [], kill_after)
            if not ready:  # still running: kill it
                try:
                    os.kill(int(pid), signal.SIGKILL)
                except ProcessLookupError:  # it finished in between
                    pass
        word, status = self._line(60).split()
        seconds = time.monotonic() - started
        assert word == "exit"
        status = int(status)
        killed = os.WIFSIGNALED(status) and os.WTERMSIG(status) == signal.SIGKILL
        assert killed or (os.WIFEXITED(status) and os.WEXITSTATUS(status) == 0), f"indexer failed ({status})"
        return killed, seconds

    def close(self) -> None:
        self.proc.stdin.close()
        self.proc.wait(timeout=30)


def _check_index(folder: Path, acceptable: dict[str, set[str | None]]) -> bool:
    """Check the index after a round (see the module docstring); True when it was left stale (dirty)."""
    db = index_dir(folder) / defaults.INDEX_DB_NAME
    with sqlite3.connect(db) as conn:
        assert conn.execute("PRAGMA integrity_check").fetchone()[0] == "ok"  # SQLite documentation
    with open_index(folder) as index:
        stored = {d.path: d.sha256 for d in index.store.list_documents()}
        for rel, sha in stored.items():
            assert sha in acceptable.get(rel, set()), f"{rel}: a version that was never written"
        for rel, shas in acceptable.items():
            if rel not in stored:
                assert None in shas, f"{rel}: an indexed file vanished from the index"
        rows = index.store._conn.execute(
            'SELECT p.text, g.text, p.start, p."end" FROM passages p JOIN pages g'
            " ON g.doc_path = p.doc_path AND g.page_index = p.page_index"
        ).fetchall()
        n = index.store.count_passages()
        assert len(rows) == n and all(text == page[a:b] for text, page, a, b in rows)
        hits = index.search("termination notice days", k=5)
        assert hits or n == 0
        for passage, score in hits:
            assert score != 0 and passage.doc_path in stored
        return index.stale


def _snapshot(folder: Path) -> tuple[dict[str, str], list[tuple]]:
    with open_index(folder) as index:
        docs = {d.path: d.sha256 for d in index.store.list_documents()}
        passages = sorted(index.store._conn.execute(
            'SELECT doc_path, page_number, locator, start, "end", text, tokens FROM passages').fetchall())
        assert index.stale is False
        assert sorted(index.doc_names) == sorted({p[0] for p in passages})
    return docs, passages


@pytest.mark.skipif(not hasattr(os, "fork"), reason="needs os.fork (POSIX)")
def test_kill_minus_nine_at_random_points(tmp_path):
    rng = random.Random(SEED)  # seeded: the same rounds every run
    root = tmp_path / "contracts"
    folder = Folder(root, rng)
    for k in range(30):
        folder.write(f"{['leases', 'supply', 'misc'][k % 3]}/contract_{k:02d}{'.pdf' if k % 3 == 0 else '.txt'}")
    zygote = Zygote()
    kills = completed = rounds = dirty = 0
    typical = 0.3  # running average of a finished run's seconds: kill delays are drawn below ~1.2x that
    try:
        while kills < MIN_KILLS and rounds < MAX_ROUNDS:
            rounds += 1
            if rounds > 1:
                folder.mutate()
            delay = rng.uniform(0.0, typical * 1.2)
            killed, seconds = zygote.run(root, delay)
            if killed:
                kills += 1
            else:
                completed += 1
                typical = 0.5 * typical + 0.5 * seconds
                folder.settle()
            dirty += _check_index(root, folder.acceptable)
        killed, _ = zygote.run(root, None)  # a clean run completes the job
        assert not killed
    finally:
        zygote.close()
    print(f"kill -9 rounds: {rounds}, killed mid-run: {kills} ({dirty} left documents changed after the last "
          f"BM25 build), finished before the kill: {completed}")
    assert kills >= MIN_KILLS

    fresh = tmp_path / "fresh"
    shutil.copytree(root, fresh, ignore=shutil.ignore_patterns(defaults.INDEX_DIR_NAME), symlinks=True)
    refresh_index(fresh)
    docs, passages = _snapshot(root)
    assert docs == folder.current()
    assert (docs, passages) == _snapshot(fresh)
    leftovers = sorted(p.name for p in index_dir(root).iterdir() if p.name.startswith("bm25-"))
    assert len(leftovers) == 1, leftovers  # temp files of killed rebuilds were cleaned up
