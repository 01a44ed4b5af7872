"""Which gold answer a training window is labelled with, when annotators gave several.

SQuAD-style test sets keep every annotator's span and score a prediction by its best match (max over golds). Training
on the first listed span alone teaches whatever that one annotator did; in SQuADShifts the first span is often a whole
clause while the others agree on a short phrase. The consensus span is the medoid under the official token F1:

    consensus = argmax_i  sum_{j != i} F1(a_i, a_j)

ties broken by the earlier answer. With one answer (or two), the first answer is kept, so single-annotator data is
unchanged.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Sequence

from engine.metrics import f1_v1
from engine.squad_data import SquadExample


def consensus_index(answers: Sequence[str]) -> int:
    """Index of the medoid answer text by token F1 (see module docstring); 0 for fewer than three answers."""
    if len(answers) < 3:
        return 0
    scores = [sum(f1_v1(a, b) for j, b in enumerate(answers) if j != i) for i, a in enumerate(answers)]
    return scores.index(max(scores))


def with_consensus_first(example: SquadExample) -> SquadExample:
    """The same example with its consensus answer moved to the front (the span that windows are labelled with)."""
    k = consensus_index([a.text for a in example.answers])
    if k == 0:
        return example
    answers = (example.answers[k],) + example.answers[:k] + example.answers[k + 1:]
    return replace(example, answers=answers)
