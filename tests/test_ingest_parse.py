"""parse_file never raises on bad bytes: it returns a Document or one fatal problem."""

from __future__ import annotations

import tempfile
from pathlib import Path

from hypothesis import given, settings
from hypothesis import strategies as st

from engine.ingest.parse import parse_file

_PREFIXES = [b"", b"%PDF-1.4\n", b"PK\x03\x04", b"\xef\xbb\xbf", b"\xff\xfe"]


@settings(max_examples=60, deadline=None)
@given(
    suffix=st.sampled_from([".pdf", ".txt", ".md", ".docx"]),
    prefix=st.sampled_from(_PREFIXES),
    body=st.binary(max_size=300),
)
def test_random_bytes_never_raise(suffix, prefix, body):
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / f"f{suffix}"
        path.write_bytes(prefix + body)
        doc, problems = parse_file(path, path.name)
    if doc is None:
        assert len(problems) == 1 and problems[0].fatal and problems[0].reason
        assert "\n" not in problems[0].reason  # one plain line
    else:
        assert all(not p.fatal for p in problems)
        assert [p.reason for p in problems] == list(doc.warnings)
