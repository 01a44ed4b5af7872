"""Ingest: find files in a folder and parse them into ``Document`` records.

Public entry points: ``walk_folder`` (engine.ingest.walker) and ``parse_file`` (engine.ingest.parse).
Format readers raise ``UnreadableFile(reason)``; ``parse_file`` turns it into a fatal ``IngestProblem``.
"""

from __future__ import annotations


class UnreadableFile(Exception):
    """A file that cannot be indexed; ``str(exc)`` is one plain-language line for the user."""


from engine.ingest.parse import parse_file  # noqa: E402  (UnreadableFile must exist first)
from engine.ingest.walker import SUPPORTED_SUFFIXES, walk_folder  # noqa: E402

__all__ = ["SUPPORTED_SUFFIXES", "UnreadableFile", "parse_file", "walk_folder"]
