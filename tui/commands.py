"""Command palette entries (Ctrl+P): the main actions of the app, by name."""

from __future__ import annotations

from functools import partial

from textual.command import DiscoveryHit, Hit, Hits, Provider

# (title, help, app action)
COMMANDS: tuple[tuple[str, str, str], ...] = (
    ("Ask a question", "Put the cursor in the question box", "ask"),
    ("Set the scope…", "Limit the next questions to one document or subfolder", "scope"),
    ("Clear the scope", "Ask the whole folder again", "clear_scope"),
    ("Question history…", "Reopen an earlier question with its answers and decisions", "history"),
    ("Export the answer log…", "Write asked questions, checklist cells and decisions to CSV, JSONL, MD or XLSX",
     "export"),
    ("Checklist grid", "Documents × checklist questions; run or resume a sweep", "grid"),
    ("Files with problems", "Files that could not be indexed, with the reason", "problems"),
    ("Re-index the folder", "Pick up added, changed and removed files", "reindex"),
    ("Keys", "Every key, by where it works", "help"),
)


class ExcerptorCommands(Provider):
    """Fuzzy search over COMMANDS; each hit runs the app-level action of the same name."""

    async def discover(self) -> Hits:
        for title, help_text, action in COMMANDS:
            yield DiscoveryHit(title, partial(self.app.run_action, action), help=help_text)

    async def search(self, query: str) -> Hits:
        matcher = self.matcher(query)
        for title, help_text, action in COMMANDS:
            score = matcher.match(title)
            if score > 0:
                yield Hit(score, matcher.highlight(title), partial(self.app.run_action, action), help=help_text)
