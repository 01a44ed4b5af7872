"""The transformer reader: a BERT-family encoder with a start/end head, loaded offline from a model folder."""

from __future__ import annotations

import os
import warnings
from contextlib import contextmanager
from pathlib import Path
from typing import Sequence

import numpy as np

from engine import defaults
from engine.model_folder import require_model_folder
from engine.reader.decode import decode_spans, token_span_to_chars
from engine.reader.interface import Reading, ReadSpan
from engine.reader.span_choice import choose_span
from engine.reader.windows import Window, build_windows, pad_batch

QUANTIZE_CHOICES = (
    "none", "attention", "all-but-ffn-output", "all", "all-but-ffn-output-per-channel", "all-per-channel",
    "all-but-ffn-output-per-token", "all-per-token",
)
PER_CHANNEL_SUFFIX = "-per-channel"
PER_TOKEN_SUFFIX = "-per-token"  # engine.reader.token_int8: one input scale per token, one weight scale per row
# torch 2.13 (pinned) warns on every quantised-tensor creation that these functions will go in a later release. They
# work in the pinned version and the int8 path is tested, so the notice is kept out of the user's terminal.
TORCH_QUANTIZED_DEPRECATION = r"torch\.quantize_per_tensor, torch\.quantize_per_channel and other quantized tensor"


def repository_root() -> Path:
    return Path(__file__).resolve().parents[2]


def default_model_dir() -> Path:
    """The committed reader, or ``EXCERPTOR_READER_DIR`` when set."""
    override = os.environ.get("EXCERPTOR_READER_DIR")
    return Path(override) if override else repository_root() / defaults.READER_MODEL_DIR


def quantized_layer_names(model, mode: str) -> set[str]:
    """Names of the Linear layers a quantisation mode turns into int8 (the span head always stays fp32).

    ``attention``: query/key/value/attention-output layers; ``all-but-ffn-output``: every Linear except each
    feed-forward block's output projection; ``all``: every Linear in the encoder. A ``-per-channel`` or
    ``-per-token`` suffix names the same layers as the mode without it.
    """
    import torch

    if mode not in QUANTIZE_CHOICES:
        raise ValueError(f"quantize must be one of {QUANTIZE_CHOICES} (got {mode!r})")
    mode = mode.removesuffix(PER_CHANNEL_SUFFIX).removesuffix(PER_TOKEN_SUFFIX)
    names: set[str] = set()
    if mode == "none":
        return names
    for name, module in model.named_modules():
        if not isinstance(module, torch.nn.Linear) or "qa_outputs" in name:
            continue
        is_attention = ".attention." in name
        is_ffn_output = name.endswith(".output.dense") and ".attention." not in name
        if (mode == "attention" and is_attention) or (mode == "all-but-ffn-output" and not is_ffn_output) \
                or mode == "all":
            names.add(name)
    return names


def replace_module(model, name: str, replacement) -> None:
    """Put ``replacement`` where the submodule ``name`` (dotted path) of ``model`` was."""
    parent_name, _, child = name.rpartition(".")
    setattr(model.get_submodule(parent_name), child, replacement)


def quantize_reader(model, mode: str):
    """int8 dynamic quantisation (``torch.ao.quantization.quantize_dynamic``) of the layers
    ``quantized_layer_names`` picks. A ``-per-channel`` mode quantises them with one weight scale per output row
    instead of one per tensor (``per_channel_dynamic_qconfig``), which keeps more precision for rows with small
    weights. A ``-per-token`` mode uses ``TokenInt8Linear`` instead: one input scale per token as well.
    """
    import torch
    from torch.ao.quantization import default_dynamic_qconfig, per_channel_dynamic_qconfig, quantize_dynamic

    names = quantized_layer_names(model, mode)
    if mode == "none":
        return model
    if mode.endswith(PER_TOKEN_SUFFIX):
        from engine.reader.token_int8 import swap_in_token_int8

        return swap_in_token_int8(model, names)
    qconfig = per_channel_dynamic_qconfig if mode.endswith(PER_CHANNEL_SUFFIX) else default_dynamic_qconfig
    with warnings.catch_warnings():
        warnings.filterwarnings("ignore", message=TORCH_QUANTIZED_DEPRECATION, category=UserWarning)
        return quantize_dynamic(model, {name: qconfig for name in names}, dtype=torch.qint8)


@contextmanager
def _no_progress_bar():
    """Keeps transformers' "Loading weights" progress bar off stderr (the app and CLI own the terminal), then puts
    the library's setting back."""
    from transformers.utils import logging as transformers_logging

    was_enabled = transformers_logging.is_progress_bar_enabled()
    transformers_logging.disable_progress_bar()
    try:
        yield
    finally:
        if was_enabled:
            transformers_logging.enable_progress_bar()


class TransformerReader:
    """Reads spans with an ``AutoModelForQuestionAnswering`` from a local folder; never touches the network."""

    def __init__(
        self,
        model_dir: Path | str | None = None,
        *,
        quantize: str | None = None,
        batch_size: int = defaults.READER_BATCH_SIZE,
        max_length: int = defaults.MAX_SEQ_LENGTH,
        stride: int = defaults.DOC_STRIDE,
        max_answer_tokens: int = defaults.MAX_ANSWER_TOKENS,
        threads: int | None = None,
    ) -> None:
        os.environ["HF_HUB_OFFLINE"] = "1"
        os.environ["TRANSFORMERS_OFFLINE"] = "1"
        import torch
        from transformers import AutoModelForQuestionAnswering, AutoTokenizer

        if batch_size < 1:
            raise ValueError(f"batch_size must be >= 1 (got {batch_size})")
        self.model_dir = require_model_folder(model_dir or default_model_dir(), "the reader folder")
        if threads:
            torch.set_num_threads(threads)
        self.quantize = quantize or read_default_quantize(self.model_dir)
        tokenizer = AutoTokenizer.from_pretrained(self.model_dir, local_files_only=True)
        with _no_progress_bar():
            model = AutoModelForQuestionAnswering.from_pretrained(
                self.model_dir, local_files_only=True, use_safetensors=True, dtype=torch.float32
            )
        model.eval()
        self._hold(quantize_reader(model, self.quantize), tokenizer, batch_size, max_length, stride,
                   max_answer_tokens, name=f"{self.model_dir.name} ({self.quantize})")

    @classmethod
    def in_memory(cls, model, tokenizer, name: str = "in memory") -> "TransformerReader":
        """A reader over a model already loaded in fp32 (a model being trained), with the default windows."""
        reader = cls.__new__(cls)
        reader.model_dir, reader.quantize = None, "none"
        reader._hold(model, tokenizer, defaults.READER_BATCH_SIZE, defaults.MAX_SEQ_LENGTH, defaults.DOC_STRIDE,
                     defaults.MAX_ANSWER_TOKENS, name=name)
        return reader

    def _hold(self, model, tokenizer, batch_size: int, max_length: int, stride: int, max_answer_tokens: int,
              name: str) -> None:
        """Set what reading needs besides ``model_dir`` and ``quantize``; the one place that lists it."""
        self.model, self.tokenizer = model, tokenizer
        self.batch_size = batch_size
        self.max_length = max_length
        self.stride = stride
        self.max_answer_tokens = max_answer_tokens
        self.name = name
        self.windows_read = 0

    def window_logits(self, windows: Sequence[Window]) -> list[tuple[np.ndarray, np.ndarray]]:
        """Start and end logits per window. Windows are batched by length to limit padding.

        Invariant: a window's logits do not depend on the other windows read with it. Dynamic int8 takes each
        layer's input range over the whole batch, so an int8 path reads one window per forward pass (measured on
        2 cores: 23.4 against 20.6 ms a window for the default variant); fp32 batches ``batch_size`` windows.
        Per-token int8 would batch safely, but one window at a time is faster for it too (its rescaling of a
        16-window product is memory-bound: 26.5 against 16 x 0.57 ms for one 384 x 1536 layer on 2 cores).
        """
        import torch

        batch_size = self.batch_size if self.quantize == "none" else 1
        order = sorted(range(len(windows)), key=lambda i: len(windows[i].input_ids))
        out: list[tuple[np.ndarray, np.ndarray] | None] = [None] * len(windows)
        with torch.inference_mode():
            for lo in range(0, len(order), batch_size):
                idx = order[lo: lo + batch_size]
                batch = {k: torch.from_numpy(v) for k, v in pad_batch([windows[i] for i in idx]).items()}
                result = self.model(**batch)
                starts = result.start_logits.float().numpy()
                ends = result.end_logits.float().numpy()
                for row, i in enumerate(idx):
                    n = len(windows[i].input_ids)
                    out[i] = (starts[row, :n], ends[row, :n])
        self.windows_read += len(windows)
        return out  # type: ignore[return-value]

    def read_pairs(self, pairs: Sequence[tuple[str, str]], n_best: int = 5) -> list[Reading]:
        windows = build_windows(self.tokenizer, pairs, max_length=self.max_length, stride=self.stride)
        logits = self.window_logits(windows)
        return collect_readings(pairs, windows, logits, n_best, self.max_answer_tokens)


def collect_readings(pairs, windows, logits, n_best: int, max_answer_tokens: int,
                     candidates: int = defaults.SPAN_CHOICE_CANDIDATES,
                     temperature: float = defaults.SPAN_CHOICE_TEMPERATURE) -> list[Reading]:
    """Merge window spans per pair (best score per character span; null score = min over windows), then put the
    expected-F1 choice among the ``candidates`` best spans first (``span_choice``, at ``temperature``) and keep
    ``n_best`` spans. ``candidates=1`` keeps the top-scored span first."""
    if n_best < 1 or candidates < 1:
        raise ValueError(f"n_best and candidates must be >= 1 (got {n_best} and {candidates})")
    per_window = max(n_best, candidates)
    best: list[dict[tuple[int, int], float]] = [dict() for _ in pairs]
    nulls = [np.inf] * len(pairs)
    counts = [0] * len(pairs)
    for window, (start, end) in zip(windows, logits):
        spans, null = decode_spans(
            start, end, np.array(window.context_mask), max_answer_tokens=max_answer_tokens, n_best=per_window
        )
        p = window.pair_index
        counts[p] += 1
        nulls[p] = min(nulls[p], null)
        for span in spans:
            key = token_span_to_chars(span, window.offsets)
            if key[1] > key[0] and span.score > best[p].get(key, -np.inf):
                best[p][key] = span.score
    readings = []
    for p, (_, context) in enumerate(pairs):
        ranked = sorted(best[p].items(), key=lambda kv: (-kv[1], kv[0]))[:per_window]
        spans = [ReadSpan(s, e, context[s:e], float(score)) for (s, e), score in ranked]
        if spans:
            pool = spans[:candidates]
            chosen = choose_span([s.text for s in pool], [s.score for s in pool], temperature)
            spans.insert(0, spans.pop(chosen))
        readings.append(Reading(tuple(spans[:n_best]), float(nulls[p]) if counts[p] else 0.0, counts[p]))
    return readings


def read_default_quantize(model_dir: Path) -> str:
    """The model folder's calibration names its default quantisation; 'none' if absent."""
    from engine.calibration import load_calibration

    return load_calibration(model_dir).default_quantize
