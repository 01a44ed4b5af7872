"""Reader calibration: the no-answer margin, the retriever/reader fusion weight and the confidence curve.

Confidence is a logistic curve over the answer's margin m = (best span score) - (null score) of its passage:
``confidence = 1 / (1 + exp(-(a * m + b)))``, with a and b fitted by maximum likelihood on dev data, where the
label is "the answer matches gold with token F1 >= 0.5". The same margin means the same confidence for every
question, which makes scores comparable across questions.

Fusion (Yang et al., 2019, BERTserini): ``S = (1 - mu) * S_bm25 + mu * S_reader``, here with S_bm25 the passage's
BM25 score divided by the best BM25 score of the question, and S_reader the margin m; mu is tuned on dev.
"""

from __future__ import annotations

import json
import math
import os
from dataclasses import asdict, dataclass
from pathlib import Path

import numpy as np

CALIBRATION_FILE = "excerptor.json"


def abstains(null_margin, threshold: float):
    """The no-answer rule (SQuAD 2.0 convention): abstain when null score - best span score > threshold, i.e. answer
    only when the best span's margin m = best - null is at least -threshold; a higher threshold answers more.
    Takes a float or a numpy array of null margins."""
    return null_margin > threshold


@dataclass(frozen=True)
class Calibration:
    null_margin_threshold: float = 0.0  # abstain when null - best span > this
    fusion_weight: float = 0.5  # mu
    confidence_slope: float = 0.5  # a
    confidence_intercept: float = 0.0  # b
    default_quantize: str = "none"

    def confidence(self, margin: float) -> float:
        z = self.confidence_slope * margin + self.confidence_intercept
        return 1.0 / (1.0 + math.exp(-max(-60.0, min(60.0, z))))

    def fused(self, bm25_relative: float, margin: float) -> float:
        return (1.0 - self.fusion_weight) * bm25_relative + self.fusion_weight * margin


def read_calibration_file(model_dir: Path) -> dict:
    """Everything a reader folder's ``CALIBRATION_FILE`` records ({} when it has none)."""
    path = Path(model_dir) / CALIBRATION_FILE
    return json.loads(path.read_text(encoding="utf-8")) if path.exists() else {}


def load_calibration(model_dir: Path) -> Calibration:
    raw = read_calibration_file(model_dir)
    return Calibration(**{k: raw[k] for k in Calibration.__dataclass_fields__ if k in raw})


def calibration_dict(calibration: Calibration, **extra) -> dict:
    return {**asdict(calibration), **extra}


def write_calibration_file(model_dir: Path, payload: dict) -> Path:
    """Write ``CALIBRATION_FILE`` atomically (temporary file, then rename), so a reader folder never holds half of
    one."""
    target = Path(model_dir) / CALIBRATION_FILE
    tmp = target.with_name(target.name + ".tmp")
    tmp.write_text(json.dumps(payload, indent=2, sort_keys=True) + "\n", encoding="utf-8")
    os.replace(tmp, target)
    return target


def fit_logistic(x: np.ndarray, y: np.ndarray, iterations: int = 50, l2: float = 1e-3) -> tuple[float, float]:
    """Newton-Raphson maximum likelihood for p = sigmoid(a x + b), with a small L2 penalty for stability."""
    x = np.asarray(x, dtype=np.float64)
    y = np.asarray(y, dtype=np.float64)
    if x.shape != y.shape or x.ndim != 1 or x.size < 2:
        raise ValueError(f"need two 1-D arrays of one length >= 2 (got {x.shape} and {y.shape})")
    design = np.stack([x, np.ones_like(x)], axis=1)
    w = np.zeros(2)
    for _ in range(iterations):
        p = 1.0 / (1.0 + np.exp(-(design @ w)))
        gradient = design.T @ (p - y) + l2 * w
        hessian = (design * (p * (1 - p))[:, None]).T @ design + l2 * np.eye(2)
        step = np.linalg.solve(hessian, gradient)
        w -= step
        if np.abs(step).max() < 1e-10:
            break
    return float(w[0]), float(w[1])
