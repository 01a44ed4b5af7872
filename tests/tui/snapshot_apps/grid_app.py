"""Snapshot app: demo_docs with the commercial checklist already swept by the fake reader."""

from launcher import build

app = build(swept=True)
