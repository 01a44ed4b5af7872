"""int8 variants of the committed reader, measured against its own fp32 logits (the reference here).

Per-channel weight scales (one per output row) can only represent each row at least as finely as one scale for the
whole tensor, so on the same layers their logits must sit closer to fp32 (Krishnamoorthi, 2018, "Quantizing deep
convolutional networks for efficient inference", section 2: per-channel quantisation of weights; cited from memory).
"""

import copy

import numpy as np
import pytest

from tests.shared_data import reader_dir

pytestmark = pytest.mark.real_model

CONTEXT = ("The lease of the grain store at Pellow Quay runs for five years from 1 March 2024. "
           "Either party may end it by giving not less than ninety days' written notice.")
QUESTION = "How much notice must be given to end the lease?"


@pytest.fixture(scope="module")
def model_and_inputs():
    import torch
    from transformers import AutoModelForQuestionAnswering, AutoTokenizer

    torch.manual_seed(0)
    folder = reader_dir()
    tokenizer = AutoTokenizer.from_pretrained(folder, local_files_only=True)
    model = AutoModelForQuestionAnswering.from_pretrained(folder, local_files_only=True).float().eval()
    return model, tokenizer(QUESTION, CONTEXT, return_tensors="pt")


def logits(model, inputs) -> np.ndarray:
    import torch

    with torch.inference_mode():
        out = model(**inputs)
    return np.concatenate([out.start_logits.numpy(), out.end_logits.numpy()])


def test_per_channel_int8_tracks_fp32_closer_than_per_tensor(model_and_inputs):
    from engine.reader.transformer_reader import quantize_reader

    model, inputs = model_and_inputs
    reference = logits(model, inputs)
    error = {mode: np.abs(logits(quantize_reader(copy.deepcopy(model), mode), inputs) - reference).mean()
             for mode in ("all", "all-per-channel", "all-but-ffn-output", "all-but-ffn-output-per-channel")}
    # Same layers, finer scales: closer to fp32. (Quantising fewer layers is not compared: on one input it need not
    # be closer, and with reader-v8 `all-but-ffn-output-per-channel` is 0.230 off against `all-per-channel`'s 0.215.)
    assert 0 < error["all-per-channel"] < error["all"]
    assert 0 < error["all-but-ffn-output-per-channel"] < error["all-but-ffn-output"]
    # Every variant still points at the same best start and end token as fp32.
    for mode in ("all-per-channel", "all-but-ffn-output-per-channel"):
        q = logits(quantize_reader(copy.deepcopy(model), mode), inputs)
        assert (q.argmax(axis=1) == reference.argmax(axis=1)).all()


def test_unknown_quantize_mode_names_the_choices(model_and_inputs):
    from engine.reader.transformer_reader import quantize_reader

    with pytest.raises(ValueError, match=r"got 'int4'"):
        quantize_reader(model_and_inputs[0], "int4")


def test_int8_path_keeps_torchs_removal_notice_out_of_the_terminal_but_no_other_warning(model_and_inputs):
    """torch 2.13 warns that quantised-tensor creation will be removed; only that notice is silenced."""
    import warnings

    from engine.reader.transformer_reader import quantize_reader

    model, inputs = model_and_inputs
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        logits(quantize_reader(copy.deepcopy(model), "attention"), inputs)
        warnings.warn("an unrelated notice", UserWarning)
    messages = [str(w.message) for w in caught]
    assert not any("quantize_per_tensor" in m for m in messages)
    assert "an unrelated notice" in messages


@pytest.mark.parametrize("mode", ["all-but-ffn-output-per-channel", "all"])
def test_an_int8_windows_logits_do_not_depend_on_the_windows_read_beside_it(mode):
    """Dynamic int8 takes each layer's input range over the whole forward pass (torch's quantize_dynamic), so a
    window read in a batch would borrow its neighbours' ranges; the reader reads int8 windows one at a time."""
    from engine.reader.transformer_reader import TransformerReader
    from engine.reader.windows import build_windows

    reader = TransformerReader(reader_dir(), quantize=mode, batch_size=16)
    pairs = [(QUESTION, CONTEXT),
             ("What is the rent?", "The annual rent is forty thousand crowns, payable quarterly in advance. " * 12),
             ("Who is the tenant?", "Harrow Mill Estates lets the store to Quayside Grain Cooperative. " * 6)]
    windows = build_windows(reader.tokenizer, pairs, max_length=reader.max_length, stride=reader.stride)
    alone = reader.window_logits(windows[:1])[0]
    together = reader.window_logits(windows)[0]
    assert len(windows) >= 3
    assert np.array_equal(alone[0], together[0]) and np.array_equal(alone[1], together[1])


def test_per_token_int8_tracks_fp32_closer_than_per_channel_and_ignores_its_batch(model_and_inputs):
    """One input scale per token (engine.reader.token_int8) keeps the other tokens' precision when a few tokens carry
    large values, so on the same layers it must sit closer to fp32 than torch's one range per tensor (LLM.int8(),
    Dettmers et al., 2022, section 3; from memory). Each row is scaled alone, so padding a window into a batch beside
    a longer one leaves its logits as they were."""
    import torch

    from engine.reader.transformer_reader import quantize_reader

    model, inputs = model_and_inputs
    reference = logits(model, inputs)
    per_token_model = quantize_reader(copy.deepcopy(model), "all-per-token")
    per_token = logits(per_token_model, inputs)
    per_channel = logits(quantize_reader(copy.deepcopy(model), "all-per-channel"), inputs)
    assert 0 < np.abs(per_token - reference).mean() < np.abs(per_channel - reference).mean()
    assert (per_token.argmax(axis=1) == reference.argmax(axis=1)).all()

    n = inputs["input_ids"].shape[1]
    longer = {k: torch.cat([v, v[:, 1:9]], dim=1) for k, v in inputs.items()}
    batch = {k: torch.cat([torch.nn.functional.pad(inputs[k], (0, 8)), longer[k]]) for k in inputs}
    with torch.inference_mode():
        out = per_token_model(**batch)
    # Equal here; the tolerance only allows for a CPU whose fp32 kernels round differently in a batch of two, where
    # one flipped int8 step moves a logit by about 1e-3 (torch's per-tensor int8 moved reader-v8's by up to 1.12).
    assert np.abs(out.start_logits[0, :n].numpy() - per_token[0]).max() < 0.01
    assert np.abs(out.end_logits[0, :n].numpy() - per_token[1]).max() < 0.01
