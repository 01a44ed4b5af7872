"""Scale benchmarks: indexing, PDF parsing, retrieval against rank-bm25, the reader end to end, demo recall.

    python bench/bench_scale.py --sizes 100 1000 [--reader] [--out docs/benchmarks.md]

Per corpus size (documents from bench/make_corpus.py, reused from --work when already written):
- index build in a child process (first run on an empty index, then a re-run with nothing changed): seconds
  of refresh_index after the engine's imports (about 2 s, reported apart), pages/s (.txt pages, so no PDF
  parsing) and the child's peak memory (getrusage ru_maxrss; its level right after the imports too);
- index size on disk (the SQLite store plus the BM25 file);
- PDF parsing pages/s on the PDF sample: the engine's read_pdf, and raw pypdf extract_text (the limit; the
  engine adds text repair on top);
- retrieval latency over the sample questions, each timed ``--repeat`` times keeping its fastest:
  ours = Bm25Index.top_k; reference = rank_bm25.BM25Okapi.get_scores + argsort, on the same token lists (each
  passage's text tokens followed by its document's path tokens, as the index builds them);
  also the full search (tokenise + rank + fetch passages) and a search scoped to the question's document;
- with --reader and a committed model: Workspace.ask latency, and a brute-force reader pass over every
  passage of the question's document.
Once per run: top-3 retrieval recall on tests/data/demo_questions.jsonl over a copy of demo_docs/ (a hit: a
top-3 passage from the gold file contains the gold answer, whitespace and letter case ignored), ours vs
rank-bm25 over the same passages. Speed is measured here, never in timed tests.
"""

from __future__ import annotations

import argparse
import io
import json
import os
import platform
import shutil
import subprocess
import sys
import tempfile
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from pathlib import Path

import numpy as np

REPO = Path(__file__).resolve().parents[1]
for _p in (REPO, REPO / "bench"):
    if str(_p) not in sys.path:
        sys.path.insert(0, str(_p))

from make_corpus import Corpus, ensure_corpus  # noqa: E402
from rank_bm25 import BM25Okapi  # noqa: E402

from scale_report import render  # noqa: E402

from engine import defaults  # noqa: E402
from engine.bm25_file import bm25_documents  # noqa: E402
from engine.indexer import LoadedIndex, open_index, refresh_index  # noqa: E402
from engine.text_tokens import tokenize_for_search  # noqa: E402

K = defaults.TOP_K_PASSAGES

_BUILD_CHILD = """
import json, resource, sys, time
t = time.perf_counter()
import engine.indexer, engine.ingest.parse, engine.ingest.walker, engine.passages, engine.sentences
imports_s = time.perf_counter() - t
base_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
t = time.perf_counter()
rep = engine.indexer.refresh_index(sys.argv[1])
print(json.dumps({"seconds": time.perf_counter() - t, "indexed": len(rep.indexed), "unchanged": len(rep.unchanged),
                  "failed": len(rep.failed), "n_passages": rep.n_passages, "imports_s": imports_s,
                  "base_mb": base_mb, "maxrss_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
"""


@dataclass(frozen=True)
class Latency:
    """Percentiles (numpy linear interpolation) of per-query seconds."""

    p50: float
    p95: float
    n: int

    @classmethod
    def of(cls, seconds: Sequence[float]) -> Latency:
        if not seconds:
            raise ValueError(f"need at least one timing (got {len(seconds)})")
        p50, p95 = np.percentile(np.asarray(seconds, dtype=np.float64), [50, 95])
        return cls(float(p50), float(p95), len(seconds))

    def ms(self) -> str:
        return f"{self.p50 * 1e3:.2f} / {self.p95 * 1e3:.2f} ms"

    def s(self) -> str:
        return f"{self.p50:.3f} / {self.p95:.3f} s"


def fastest(fn: Callable[[], object], repeat: int) -> float:
    """Smallest wall time of ``repeat`` calls (filters out pauses caused by other work on the machine)."""
    best = float("inf")
    for _ in range(max(1, repeat)):
        t = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t)
    return best


def machine_info() -> dict[str, str]:
    cpu = platform.processor() or "unknown"
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    try:
        import torch

        torch_threads = f"{torch.get_num_threads()} (torch {torch.__version__})"
    except ImportError:
        torch_threads = "n/a (torch not installed)"
    usable = len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else os.cpu_count()
    load = ", ".join(f"{x:.2f}" for x in os.getloadavg()) if hasattr(os, "getloadavg") else "n/a"
    return {"CPU": cpu, "cores": f"{os.cpu_count()} ({usable} usable by this process)",
            "python": platform.python_version(), "torch threads": torch_threads, "numpy": np.__version__,
            "OS": platform.platform(), "load average at start (1/5/15 min)": load}


def run_build_child(folder: Path) -> dict:
    """Run the build in a fresh Python. It is started through /bin/sh (which forks it) because Linux carries
    the starting process's peak RSS into ru_maxrss across exec; the extra hop keeps this bench's own memory out."""
    env = {**os.environ, "PYTHONPATH": str(REPO)}
    cmd = [sys.executable, "-c", _BUILD_CHILD, str(folder)]
    if Path("/bin/sh").exists():
        cmd = ["/bin/sh", "-c", '"$0" "$@"; exit $?', *cmd]
    out = subprocess.run(cmd, cwd=REPO, env=env, capture_output=True, text=True, check=True)
    return json.loads(out.stdout.strip().splitlines()[-1])


def bench_indexing(corpus: Corpus) -> dict:
    idir = corpus.folder / defaults.INDEX_DIR_NAME
    shutil.rmtree(idir, ignore_errors=True)
    first = run_build_child(corpus.folder)
    again = run_build_child(corpus.folder)
    files = {f.name: f.stat().st_size for f in idir.iterdir() if f.is_file()}
    bm25 = sum(v for n, v in files.items() if n.startswith("bm25-"))
    return {"first": first, "again": again, "disk_total": sum(files.values()), "disk_bm25": bm25}


def _raw_pypdf(data: bytes) -> int:
    from pypdf import PdfReader

    pages = PdfReader(io.BytesIO(data), strict=False).pages
    for page in pages:
        page.extract_text()
    return len(pages)


def bench_pdf(corpus: Corpus, repeat: int) -> dict | None:
    """Per PDF, the fastest of ``repeat`` reads, engine and raw pypdf alternating; pages/s = pages / summed time."""
    from engine.ingest.pdf_pages import read_pdf

    if not corpus.pdf_files:
        return None
    out = {"files": len(corpus.pdf_files), "pages": 0, "engine_s": 0.0, "raw_pages": 0, "raw_s": 0.0}
    for name in corpus.pdf_files:
        data = (corpus.pdf_folder / name).read_bytes()
        out["pages"] += len(read_pdf(data)[0])
        out["raw_pages"] += _raw_pypdf(data)
        out["engine_s"] += fastest(lambda d=data: read_pdf(d), repeat)
        out["raw_s"] += fastest(lambda d=data: _raw_pypdf(d), repeat)
    return out


def reference_top(ref: BM25Okapi, tokens: list[str], k: int) -> tuple[np.ndarray, np.ndarray]:
    """rank-bm25 scores, best k positions by score descending, ties by lower position."""
    scores = ref.get_scores(tokens)
    order = np.argsort(-scores, kind="stable")[:k]
    return order, scores[order]


def token_lists(index: LoadedIndex) -> list[list[str]]:
    _, _, lists = bm25_documents(index.store)
    if len(lists) != index.bm25.n_passages:
        raise ValueError(f"store and BM25 file disagree (got {len(lists)} and {index.bm25.n_passages} passages)")
    return lists


def pick_questions(corpus: Corpus, n: int) -> list:
    """``n`` questions with distinct wording, spread evenly over the corpus (deterministic)."""
    seen, unique = set(), []
    for q in corpus.questions:
        if q.question.lower() not in seen:
            seen.add(q.question.lower())
            unique.append(q)
    step = max(1, len(unique) // max(1, n))
    return unique[::step][:n]


def bench_retrieval(corpus: Corpus, n_queries: int, repeat: int) -> dict:
    with open_index(corpus.folder) as index:
        lists = token_lists(index)
        t = time.perf_counter()
        ref = BM25Okapi(lists)
        ref_build_s = time.perf_counter() - t
        questions = pick_questions(corpus, n_queries)
        ours, theirs, search, scoped, same, worst = [], [], [], [], 0, 0.0
        for q in questions:
            toks = tokenize_for_search(q.question)
            index.bm25.top_k(toks, K), reference_top(ref, toks, K)  # warm-up
            ours.append(fastest(lambda t=toks: index.bm25.top_k(t, K), repeat))
            theirs.append(fastest(lambda t=toks: reference_top(ref, t, K), repeat))
            search.append(fastest(lambda q=q: index.search(q.question, K), repeat))
            scoped.append(fastest(lambda q=q: index.search(q.question, K, doc=q.doc_path), repeat))
            mine = index.bm25.top_k(toks, K)
            pos, val = reference_top(ref, toks, K)
            keep = val > 0
            same += [p for p, _ in mine] == pos[keep].tolist()
            if mine:
                worst = max(worst, float(np.max(np.abs(np.array([s for _, s in mine]) - val[keep][: len(mine)]))))
    return {"passages": len(lists), "queries": len(questions), "ours": Latency.of(ours),
            "ref": Latency.of(theirs), "search": Latency.of(search), "scoped": Latency.of(scoped),
            "same_top_k": same, "max_score_diff": worst, "ref_build_s": ref_build_s}


def bench_reader(corpus: Corpus, n_ask: int, n_brute: int) -> dict | str:
    from engine.reader.transformer_reader import default_model_dir
    from engine.workspace import Workspace

    if not (default_model_dir() / "config.json").exists():
        return "skipped: no committed reader"
    ws = Workspace(corpus.folder)
    try:
        t = time.perf_counter()
        reader = ws.ensure_reader()
        load_s = time.perf_counter() - t
        questions = pick_questions(corpus, max(n_ask, n_brute))
        ws.ask(questions[0].question)  # warm-up
        asks = []
        for q in questions[:n_ask]:
            t = time.perf_counter()
            ws.ask(q.question)
            asks.append(time.perf_counter() - t)
        brute, n_passages = [], []
        for q in questions[:n_brute]:
            positions = ws.index.scope_positions(doc=q.doc_path)
            passages = ws.index.store.get_passages(ws.index.passage_ids[positions].tolist()).values()
            pairs = [(q.question, p.text) for p in passages]
            t = time.perf_counter()
            reader.read_pairs(pairs, n_best=5)
            brute.append(time.perf_counter() - t)
            n_passages.append(len(pairs))
        return {"name": getattr(reader, "name", "reader"), "load_s": load_s, "ask": Latency.of(asks),
                "brute": Latency.of(brute), "brute_passages": float(np.mean(n_passages))}
    finally:
        ws.close()


def _norm(text: str) -> str:
    return " ".join(text.split()).casefold()


def _hit(passages, gold_file: str, answer: str) -> bool:
    return any(p.doc_path == gold_file and _norm(answer) in _norm(p.text) for p in passages)


def demo_recall(k: int = 3) -> dict:
    questions = [json.loads(x) for x in (REPO / "tests/data/demo_questions.jsonl").read_text().splitlines() if x]
    hits_ours = hits_ref = 0
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp) / "demo_docs"
        shutil.copytree(REPO / "demo_docs", folder, ignore=shutil.ignore_patterns(defaults.INDEX_DIR_NAME))
        refresh_index(folder)
        with open_index(folder) as index:
            ref = BM25Okapi(token_lists(index))
            for q in questions:
                ours = [p for p, _ in index.search(q["question"], k)]
                pos, val = reference_top(ref, tokenize_for_search(q["question"]), k)
                brute = index.store.get_passages([int(index.passage_ids[p]) for p in pos[val > 0]]).values()
                hits_ours += _hit(ours, q["file"], q["answer"])
                hits_ref += _hit(brute, q["file"], q["answer"])
    n = len(questions)
    ours_pct, ref_pct = 100.0 * hits_ours / n, 100.0 * hits_ref / n
    return {"n": n, "k": k, "ours": ours_pct, "ref": ref_pct, "loss": ref_pct - ours_pct}


def bench_size(n_docs: int, args: argparse.Namespace) -> dict:
    corpus = ensure_corpus(args.work / f"docs{n_docs}-seed{args.seed}", n_docs, args.seed,
                           min(args.pdf_sample, n_docs))
    print(f"[{n_docs} documents] corpus ready: {corpus.n_pages} pages", file=sys.stderr, flush=True)
    out = {"docs": n_docs, "pages": corpus.n_pages, "indexing": bench_indexing(corpus),
           "pdf": bench_pdf(corpus, args.repeat)}
    print(f"[{n_docs} documents] indexed; timing retrieval", file=sys.stderr, flush=True)
    out["retrieval"] = bench_retrieval(corpus, args.queries, args.repeat)
    out["reader"] = bench_reader(corpus, args.ask_questions, args.brute_questions) if args.reader else None
    return out


def parse_args(argv: list[str] | None) -> argparse.Namespace:
    ap = argparse.ArgumentParser(description="Excerptor scale benchmarks (see the module docstring).")
    ap.add_argument("--sizes", type=int, nargs="+", default=[100, 1000], help="documents per corpus")
    ap.add_argument("--reader", action="store_true", help="also time the reader (needs the committed reader)")
    ap.add_argument("--out", type=Path, help="write the report (Markdown) here as well")
    ap.add_argument("--work", type=Path, default=Path(tempfile.gettempdir()) / "excerptor-bench",
                    help="where corpora are written and reused")
    ap.add_argument("--seed", type=int, default=0)
    ap.add_argument("--pdf-sample", type=int, default=20, help="PDFs written per corpus for the parsing rows")
    ap.add_argument("--queries", type=int, default=50)
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--ask-questions", type=int, default=20)
    ap.add_argument("--brute-questions", type=int, default=5)
    ap.add_argument("--note", default="", help="a line added to the report (e.g. what else ran on the machine)")
    args = ap.parse_args(argv)
    if any(n < 1 for n in args.sizes) or args.queries < 1 or args.repeat < 1:
        raise SystemExit(f"error: sizes, --queries and --repeat must be >= 1 (got {args.sizes}, {args.queries}, "
                         f"{args.repeat})")
    args.argv = list(sys.argv[1:] if argv is None else argv)
    return args


def main(argv: list[str] | None = None) -> int:
    args = parse_args(argv)
    started = time.perf_counter()
    machine = machine_info()
    results = [bench_size(n, args) for n in args.sizes]
    recall = demo_recall()
    if hasattr(os, "getloadavg"):
        machine["load average at end (1/5/15 min)"] = ", ".join(f"{x:.2f}" for x in os.getloadavg())
    import resource

    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    machine["peak memory of this bench process (rank-bm25 included)"] = f"{peak:.0f} MB"
    report = render(args, machine, results, recall, time.perf_counter() - started)
    print(report)
    if args.out:
        args.out.parent.mkdir(parents=True, exist_ok=True)
        args.out.write_text(report + "\n", encoding="utf-8")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
