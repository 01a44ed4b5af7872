"""A fast, deterministic stand-in for the transformer reader, behind the same interface.

It scores each word of the context by how many question words appear in the 8 words before it, and returns the
best-scoring 3-word span. The null score is fixed at 0, so spans with overlap > 0 beat the null answer. It is not
a model of anything: it exists so UI, sweep and robustness tests run in milliseconds.
"""

from __future__ import annotations

import re
from typing import Sequence

from engine.calibration import Calibration
from engine.reader.interface import Reading, ReadSpan

WORD = re.compile(r"\w[\w$%,.()-]*\w|\w")


class FakeReader:
    name = "fake"

    def __init__(self) -> None:
        self.windows_read = 0
        self.calls = 0

    def read_pairs(self, pairs: Sequence[tuple[str, str]], n_best: int = 5) -> list[Reading]:
        self.calls += 1
        out = []
        for question, context in pairs:
            self.windows_read += 1
            q_words = {w.lower() for w in WORD.findall(question) if len(w) > 3}
            words = list(WORD.finditer(context))
            spans = []
            for i in range(len(words)):
                before = {m.group().lower() for m in words[max(0, i - 8): i]}
                overlap = len(q_words & before)
                if overlap:
                    last = words[min(i + 2, len(words) - 1)]
                    spans.append(ReadSpan(words[i].start(), last.end(), context[words[i].start(): last.end()],
                                          float(overlap) - i * 1e-4))
            spans.sort(key=lambda s: -s.score)
            out.append(Reading(tuple(spans[:n_best]), 0.0, 1))
        return out


FAKE_CALIBRATION = Calibration(null_margin_threshold=0.5, fusion_weight=0.5, confidence_slope=1.0,
                               confidence_intercept=-1.5, default_quantize="none")
