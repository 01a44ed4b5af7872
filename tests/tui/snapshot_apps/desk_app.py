"""Snapshot app: the desk over demo_docs with the fake reader."""

from launcher import build

app = build()
