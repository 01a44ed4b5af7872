"""Excerptor's review app (Textual). Talks to the engine only through Workspace, ReviewStore, export and sweep."""
