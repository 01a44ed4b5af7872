"""Excerptor engine: ingest, index, retrieve, read and review. Never imports the UI toolkit."""

__version__ = "0.1.0"
