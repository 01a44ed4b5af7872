"""The Markdown report of bench/bench_scale.py: one table per corpus size, the demo recall, and the goals.

Goals (the project's targets, no outside source): retrieval at least GOAL_SPEEDUP times faster than rank-bm25 at
GOAL_SPEEDUP_PASSAGES passages; ask p50/p95 within GOAL_ASK_P50/GOAL_ASK_P95 seconds at GOAL_ASK_PAGES pages;
indexing at least GOAL_PAGES_PER_S pages/s without PDF parsing; top-3 recall within GOAL_RECALL_LOSS points of
brute force.
"""

from __future__ import annotations

import argparse
import datetime as dt
import shlex

from engine import defaults

K = defaults.TOP_K_PASSAGES
ALL_SIZES = (100, 1000, 5000)
GOAL_SPEEDUP, GOAL_SPEEDUP_PASSAGES = 20.0, 100_000
GOAL_ASK_P50, GOAL_ASK_P95, GOAL_ASK_PAGES = 0.3, 0.8, 2000
GOAL_PAGES_PER_S, GOAL_RECALL_LOSS = 50.0, 2.0


def _mb(n_bytes: float) -> str:
    return f"{n_bytes / 2**20:.1f} MB"


def size_table(r: dict) -> list[str]:
    ix, rt, pdf = r["indexing"], r["retrieval"], r["pdf"]
    first, again = ix["first"], ix["again"]
    rows = [
        ("index build, first run", f"{first['seconds']:.1f} s = {r['pages'] / first['seconds']:.0f} pages/s "
         f"({first['indexed']} files, {first['failed']} failed)"),
        ("engine imports in the build process (not in the build time)", f"{first['imports_s']:.1f} s"),
        ("index re-run, nothing changed", f"{again['seconds']:.3f} s ({again['unchanged']} files unchanged)"),
        ("peak memory of the build process (ru_maxrss)", f"{first['maxrss_mb']:.0f} MB first run, "
         f"{again['maxrss_mb']:.0f} MB re-run ({first['base_mb']:.0f} MB after imports)"),
        ("index size on disk", f"{_mb(ix['disk_total'])} (BM25 file {_mb(ix['disk_bm25'])})"),
    ]
    if pdf:
        rows += [("PDF parsing, engine read_pdf", f"{pdf['pages'] / pdf['engine_s']:.1f} pages/s "
                  f"({pdf['files']} PDFs, {pdf['pages']} pages)"),
                 ("PDF parsing, raw pypdf extract_text (the limit)", f"{pdf['raw_pages'] / pdf['raw_s']:.1f} pages/s")]
    speed50, speed95 = rt["ref"].p50 / rt["ours"].p50, rt["ref"].p95 / rt["ours"].p95
    rows += [
        (f"retrieval top-{K}, ours (Bm25Index.top_k) p50 / p95", rt["ours"].ms()),
        (f"retrieval top-{K}, rank-bm25 get_scores + argsort p50 / p95", rt["ref"].ms()),
        ("speed-up over rank-bm25 (p50 / p95)", f"{speed50:.1f}x / {speed95:.1f}x"),
        ("search incl. tokenising + passage fetch p50 / p95", rt["search"].ms()),
        ("search scoped to one document p50 / p95", rt["scoped"].ms()),
        (f"top-{K} identical to rank-bm25", f"{rt['same_top_k']}/{rt['queries']} queries "
         f"(max score difference {rt['max_score_diff']:.1e})"),
        ("rank-bm25 BM25Okapi build (for reference)", f"{rt['ref_build_s']:.1f} s"),
    ]
    rd = r["reader"]
    if rd is None:
        rows.append(("reader rows", "not run (pass --reader)"))
    elif isinstance(rd, str):
        rows.append(("reader rows", rd))
    else:
        rows += [(f"ask end to end, {rd['name']}, p50 / p95 ({rd['ask'].n} questions)", rd["ask"].s()),
                 (f"brute-force reader over one document ({rd['brute_passages']:.0f} passages) p50 / p95",
                  rd["brute"].s()),
                 ("reader load", f"{rd['load_s']:.1f} s")]
    head = (f"### {r['docs']:,} documents: {r['pages']:,} pages, {rt['passages']:,} passages, "
            f"{rt['queries']} queries")
    return [head, "", "| measure | value |", "|---|---|", *[f"| {a} | {b} |" for a, b in rows], ""]


def goal_rows(results: list[dict], recall: dict, reader_requested: bool) -> list[str]:
    big = [r for r in results if r["retrieval"]["passages"] >= GOAL_SPEEDUP_PASSAGES]
    if big:
        sp = min(r["retrieval"]["ref"].p50 / r["retrieval"]["ours"].p50 for r in big)
        speed = (f"{sp:.1f}x", "met" if sp >= GOAL_SPEEDUP else "NOT met")
    else:
        most = max(r["retrieval"]["passages"] for r in results)
        speed = (f"largest run: {most:,} passages", "pending (needs --sizes 5000)")
    timed = sorted((r for r in results if isinstance(r["reader"], dict)), key=lambda x: x["pages"])
    if timed:
        r = next((x for x in timed if x["pages"] >= GOAL_ASK_PAGES), timed[-1])  # smallest run at >= 2,000 pages
        a = r["reader"]["ask"]
        ok = a.p50 <= GOAL_ASK_P50 and a.p95 <= GOAL_ASK_P95
        status = ("met" if ok else "NOT met") if r["pages"] >= GOAL_ASK_PAGES else "pending (run --sizes 200 --reader)"
        ask = (f"{a.p50:.3f} s / {a.p95:.3f} s at {r['pages']:,} pages", status)
    else:
        why = next((r["reader"] for r in results if isinstance(r["reader"], str)), None)
        ask = ("-", why or ("pending (run with --reader)" if not reader_requested else "pending"))
    low = min(r["pages"] / r["indexing"]["first"]["seconds"] for r in results)
    index = (f"{low:.0f} pages/s (slowest size)", "met" if low >= GOAL_PAGES_PER_S else "NOT met")
    rec = (f"{recall['loss']:.1f} points ({recall['ours']:.1f}% vs {recall['ref']:.1f}%)",
           "met" if recall["loss"] <= GOAL_RECALL_LOSS else "NOT met")
    rows = [(f"retrieval >= {GOAL_SPEEDUP:g}x faster than rank-bm25 at {GOAL_SPEEDUP_PASSAGES:,} passages", *speed),
            (f"ask p50 <= {GOAL_ASK_P50} s and p95 <= {GOAL_ASK_P95} s at {GOAL_ASK_PAGES:,} pages", *ask),
            (f"indexing >= {GOAL_PAGES_PER_S:g} pages/s, PDF parsing excluded", *index),
            (f"top-3 recall loss vs brute force <= {GOAL_RECALL_LOSS:g} points", *rec)]
    return ["| goal | measured | status |", "|---|---|---|", *[f"| {a} | {b} | {c} |" for a, b, c in rows], ""]


def render(args: argparse.Namespace, machine: dict, results: list[dict], recall: dict, seconds: float) -> str:
    cmd = shlex.join(["python", "bench/bench_scale.py", *args.argv])
    lines = ["# Scale benchmarks", "",
             f"Generated by `{cmd}` on {dt.datetime.now().strftime('%Y-%m-%d %H:%M')} ({seconds:.0f} s).",
             "Corpora: bench/make_corpus.py (invented agreements, about 10 .txt pages each, seed "
             f"{args.seed}). Latencies: each query timed {args.repeat} times, its fastest kept; p50/p95 over queries.",
             ""]
    if args.note:
        lines += [f"**Note:** {args.note}", ""]
    lines += ["## Machine", "", *[f"- {k}: {v}" for k, v in machine.items()], "", "## Results per size", ""]
    for r in results:
        lines += size_table(r)
    lines += ["## Demo recall (top-3 retrieval)", "",
              f"{recall['n']} questions of tests/data/demo_questions.jsonl over demo_docs/: ours "
              f"{recall['ours']:.1f}%, rank-bm25 brute force {recall['ref']:.1f}%, loss {recall['loss']:.1f} points.",
              "", "## Goals", ""]
    lines += goal_rows(results, recall, args.reader)
    pending = [f"{n:,} documents" for n in ALL_SIZES if n not in args.sizes]
    if not args.reader:
        pending.append("reader rows (--reader)")
    if pending:
        lines += ["## Pending", "", "Not measured in this run: " + ", ".join(pending) + ".", ""]
    return "\n".join(lines)
