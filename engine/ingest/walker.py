"""Find candidate files (.pdf .txt .md .docx, any letter case) under a folder.

- Hidden folders and files (name starts with '.') and folders named in ``skip_dir_names`` are skipped, as are
  Word lock files ("~$name.docx").
- Real folders are walked first; symlinked folders afterwards, each only if its resolved real path has not
  been walked yet, so a link loop or a second link to the same folder is never followed twice.
- Yields ``(absolute path, relative posix path)`` sorted by the relative path.
- A folder that cannot be listed, and a candidate file name that cannot be examined (a symlink loop,
  ELOOP), are skipped and, if ``problems`` is given, reported there. A broken link is skipped silently.
"""

from __future__ import annotations

import errno
import os
from collections import deque
from pathlib import Path
from typing import Iterator

from engine import defaults
from engine.types import IngestProblem

SUPPORTED_SUFFIXES: frozenset[str] = frozenset({".pdf", ".txt", ".md", ".docx"})


def is_candidate_name(name: str) -> bool:
    """True for a visible file name with a supported suffix (case-insensitive)."""
    if name.startswith(".") or name.startswith("~$"):
        return False
    return os.path.splitext(name)[1].lower() in SUPPORTED_SUFFIXES


def _rel(parent_rel: str, name: str) -> str:
    return f"{parent_rel}/{name}" if parent_rel else name


def walk_folder(
    root: Path,
    skip_dir_names: tuple[str, ...] = (defaults.INDEX_DIR_NAME,),
    problems: list[IngestProblem] | None = None,
) -> Iterator[tuple[Path, str]]:
    """Yield ``(absolute path, relative posix path)`` of candidate files under ``root`` (see module doc).

    Raises ValueError at once (not on first iteration) when ``root`` is not a folder.
    """
    root = Path(root)
    if not root.is_dir():
        raise ValueError(f"walk_folder needs an existing folder (got {str(root)!r})")
    return _walk(Path(os.path.abspath(root)), frozenset(skip_dir_names), problems)


def _walk(
    root_abs: Path, skip: frozenset[str], problems: list[IngestProblem] | None
) -> Iterator[tuple[Path, str]]:
    seen_dirs: set[str] = {os.path.realpath(root_abs)}
    found: list[tuple[str, Path]] = []
    real_queue: deque[tuple[Path, str]] = deque([(root_abs, "")])
    linked_queue: deque[tuple[Path, str]] = deque()

    def visit(queue: deque[tuple[Path, str]]) -> None:
        while queue:
            folder, folder_rel = queue.popleft()
            try:
                with os.scandir(folder) as it:
                    entries = sorted(it, key=lambda e: e.name)
            except OSError as exc:
                if problems is not None:
                    why = "permission denied" if isinstance(exc, PermissionError) else exc.strerror or "error"
                    problems.append(IngestProblem(folder_rel or ".", f"folder could not be read ({why})"))
                continue
            for entry in entries:
                name = entry.name
                if name.startswith("."):
                    continue
                rel = _rel(folder_rel, name)
                path = folder / name
                try:
                    is_link = entry.is_symlink()
                    is_dir = entry.is_dir(follow_symlinks=True)
                    is_file = not is_dir and entry.is_file(follow_symlinks=True)
                except OSError as exc:
                    if problems is not None and is_candidate_name(name):
                        why = "link loop" if exc.errno == errno.ELOOP else exc.strerror or "error"
                        problems.append(IngestProblem(rel, f"file could not be read ({why})"))
                    continue
                if is_dir:
                    if name in skip:
                        continue
                    if is_link:
                        linked_queue.append((path, rel))
                        continue
                    real = os.path.realpath(path)
                    if real in seen_dirs:
                        continue
                    seen_dirs.add(real)
                    queue.append((path, rel))
                elif is_file and is_candidate_name(name):
                    found.append((rel, path))

    visit(real_queue)
    while linked_queue:
        path, rel = linked_queue.popleft()
        real = os.path.realpath(path)
        if real in seen_dirs:
            continue
        seen_dirs.add(real)
        visit(deque([(path, rel)]))
    found.sort(key=lambda item: item[0])
    for rel, path in found:
        yield path, rel
