"""Snapshot app: the desk over demo_docs with the fake reader and a calibration under which every question abstains."""

from launcher import build

app = build(abstaining=True)
