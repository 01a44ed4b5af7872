"""The span loss with a weight per window.

    loss = sum_i w_i * (CE(start_logits_i, s_i) + CE(end_logits_i, e_i)) / (2 * n)

With every w_i = 1 this is the loss of transformers' ``BertForQuestionAnswering`` (the mean of the start and end
cross-entropies, Devlin et al., 2019). The sum is divided by the window count n, not by sum(w), so answer windows
(weight 1) keep their gradient when a kind of negative is weighted up: weighting adds pressure to abstain without
taking training steps away from answers, which adding more negative pairs does.
"""

from __future__ import annotations


def weighted_span_loss(start_logits, end_logits, start_positions, end_positions, weights):
    """Tensors: logits (n, length); positions (n,) int64 in [0, length); weights (n,) non-negative."""
    import torch
    import torch.nn.functional as F

    n = start_logits.shape[0]
    if weights.shape != (n,):
        raise ValueError(f"weights must hold one value per window (got shape {tuple(weights.shape)} for {n} windows)")
    if bool((weights < 0).any()):
        raise ValueError(f"weights must be non-negative (got minimum {float(weights.min())})")
    start_ce = F.cross_entropy(start_logits.float(), start_positions, reduction="none")
    end_ce = F.cross_entropy(end_logits.float(), end_positions, reduction="none")
    return (weights.to(start_ce.dtype) * (start_ce + end_ce)).sum() / (2 * n) if n else start_ce.sum()
