"""Synthetic contract folders for the scale benchmarks: N invented agreements of about ten pages each.

Layout written under OUT_DIR:

    contracts/<type>/<nnnnn>-<party>.txt   the folder to index; pages separated by form feeds (\\f), which the
                                           .txt reader turns into one Page per part ("part N")
    pdf-sample/<nnnnn>-<party>.pdf         with --pdf-sample M: the first M documents again as real PDFs
                                           (fpdf2, Helvetica, text folded to latin-1), one PDF page per \\f page
    questions.jsonl                        answerable questions drawn with the clauses (question, doc, answer)
    manifest.json                          settings and per-document page/word counts

Every document is one invented agreement from ``engine.training.synth_contracts`` (its type, parties, amounts,
dates and clause wording vary); its pages are built from that agreement's clause windows, 8-12 pages of
roughly 350-550 words (about 440 on average). Document i uses ``random.Random(seed * 1_000_003 + i)``, so the
output depends only on (seed, i): the first 100 documents of a 1,000-document corpus equal the 100-document
corpus.

CLI: ``python bench/make_corpus.py OUT_DIR --docs N [--seed S] [--pdf-sample M] [--overwrite]``
"""

from __future__ import annotations

import argparse
import json
import random
import re
import shutil
import sys
from dataclasses import asdict, dataclass
from pathlib import Path

REPO = Path(__file__).resolve().parents[1]
if str(REPO) not in sys.path:
    sys.path.insert(0, str(REPO))

# The generator's per-agreement helpers are private; they are the only way to get many windows that share one
# agreement's parties and values (``generate_windows`` gives 1-3 windows per agreement).
from engine.training.synth_contracts import _agreement, _window  # noqa: E402

GENERATOR_VERSION = 1
CONTRACTS_DIR = "contracts"
PDF_DIR = "pdf-sample"
MANIFEST = "manifest.json"
QUESTIONS = "questions.jsonl"
PAGES_RANGE = (8, 12)
PAGE_WORDS_RANGE = (280, 400)
QUESTIONS_PER_DOC = 2

_LATIN1_FOLD = str.maketrans({"\u20ac": "EUR ", "\u201c": '"', "\u201d": '"', "\u2018": "'", "\u2019": "'",
                              "\u2013": "-", "\u2014": "-", "\u00a0": " "})


@dataclass(frozen=True)
class CorpusDoc:
    path: str  # relative to contracts/, '/' separators
    title: str
    pages: int
    words: int


@dataclass(frozen=True)
class CorpusQuestion:
    question: str
    doc_path: str  # relative to contracts/
    answer: str


@dataclass(frozen=True)
class Corpus:
    root: Path  # OUT_DIR
    n_docs: int
    seed: int
    docs: tuple[CorpusDoc, ...]
    questions: tuple[CorpusQuestion, ...]
    pdf_files: tuple[str, ...]  # relative to pdf-sample/

    @property
    def folder(self) -> Path:
        """The folder to index."""
        return self.root / CONTRACTS_DIR

    @property
    def pdf_folder(self) -> Path:
        return self.root / PDF_DIR

    @property
    def n_pages(self) -> int:
        return sum(d.pages for d in self.docs)


def _slug(text: str) -> str:
    return re.sub(r"[^a-z0-9]+", "-", text.lower()).strip("-")


def make_document(seed: int, i: int) -> tuple[CorpusDoc, list[str], list[CorpusQuestion]]:
    """Document ``i`` of corpus ``seed``: its record, page texts and answerable questions (deterministic)."""
    if i < 0:
        raise ValueError(f"document index must be >= 0 (got {i})")
    r = random.Random(seed * 1_000_003 + i)
    c = _agreement(r)
    path = f"{_slug(c['Title'])}/{i:05d}-{_slug(c['name_a'])[:40]}.txt"
    n_pages = r.randint(*PAGES_RANGE)
    pages: list[str] = []
    asked: list[CorpusQuestion] = []
    widx = 0
    for p in range(1, n_pages + 1):
        target = r.randint(*PAGE_WORDS_RANGE)
        parts = [f"{c['TITLE']}\n\nbetween {c['name_a']} and {c['name_b']}"] if p == 1 else []
        words = sum(len(x.split()) for x in parts)
        while words < target:
            w = _window(r, c, widx, f"bench{seed}")
            widx += 1
            parts.append(w.context)
            words += len(w.context.split())
            asked += [CorpusQuestion(q.question, path, q.answer[0]) for q in w.questions if q.answer is not None]
        footer = f"{c['Title']} - {c['name_a']} / {c['name_b']} - page {p} of {n_pages}"
        pages.append("\n\n".join(parts) + "\n\n" + footer + "\n")
    chosen = r.sample(asked, min(QUESTIONS_PER_DOC, len(asked)))
    doc = CorpusDoc(path, c["Title"], n_pages, sum(len(t.split()) for t in pages))
    return doc, pages, chosen


def latin1(text: str) -> str:
    """Text Helvetica (a latin-1 core font) can draw: common typographic marks folded, the rest as '?'."""
    return text.translate(_LATIN1_FOLD).encode("latin-1", "replace").decode("latin-1")


def write_pdf(path: Path, pages: list[str]) -> None:
    """One PDF page per entry (a page that overflows continues on an extra PDF page)."""
    from fpdf import FPDF

    pdf = FPDF(format="letter", unit="mm")
    pdf.set_margins(20, 18, 20)
    pdf.set_auto_page_break(True, margin=18)
    pdf.set_font("Helvetica", size=9.5)
    for text in pages:
        pdf.add_page()
        pdf.multi_cell(0, 4.2, latin1(text))
    pdf.output(str(path))


def _owned(out_dir: Path) -> bool:
    return (out_dir / MANIFEST).is_file()


def write_corpus(out_dir: Path | str, n_docs: int, seed: int = 0, pdf_sample: int = 0,
                 overwrite: bool = False) -> Corpus:
    """Write the layout described in the module docstring and return what was written."""
    out_dir = Path(out_dir)
    if not isinstance(n_docs, int) or n_docs < 1:
        raise ValueError(f"n_docs must be a positive int (got {n_docs!r})")
    if not 0 <= pdf_sample <= n_docs:
        raise ValueError(f"pdf_sample must lie in [0, n_docs] (got {pdf_sample} for {n_docs} documents)")
    if out_dir.exists() and any(out_dir.iterdir()):
        if not (overwrite and _owned(out_dir)):
            raise ValueError(f"{out_dir} is not empty (got existing files; --overwrite replaces a corpus it wrote)")
        for name in (CONTRACTS_DIR, PDF_DIR):
            shutil.rmtree(out_dir / name, ignore_errors=True)
        for name in (MANIFEST, QUESTIONS):
            (out_dir / name).unlink(missing_ok=True)
    (out_dir / CONTRACTS_DIR).mkdir(parents=True, exist_ok=True)
    if pdf_sample:
        (out_dir / PDF_DIR).mkdir(exist_ok=True)
    docs, questions, pdfs = [], [], []
    for i in range(n_docs):
        doc, pages, asked = make_document(seed, i)
        target = out_dir / CONTRACTS_DIR / doc.path
        target.parent.mkdir(exist_ok=True)
        target.write_text("\f".join(pages), encoding="utf-8")
        if i < pdf_sample:
            name = Path(doc.path).with_suffix(".pdf").name
            write_pdf(out_dir / PDF_DIR / name, pages)
            pdfs.append(name)
        docs.append(doc)
        questions += asked
    with open(out_dir / QUESTIONS, "w", encoding="utf-8") as f:
        for q in questions:
            f.write(json.dumps(asdict(q), ensure_ascii=False) + "\n")
    corpus = Corpus(out_dir, n_docs, seed, tuple(docs), tuple(questions), tuple(pdfs))
    manifest = {"generator_version": GENERATOR_VERSION, "n_docs": n_docs, "seed": seed, "pdf_sample": pdf_sample,
                "pages": corpus.n_pages, "words": sum(d.words for d in docs), "pdf_files": pdfs,
                "docs": [asdict(d) for d in docs]}
    (out_dir / MANIFEST).write_text(json.dumps(manifest, indent=1), encoding="utf-8")  # last: marks completion
    return corpus


def load_corpus(out_dir: Path | str) -> Corpus:
    """Read a corpus written by :func:`write_corpus`. Raises ValueError if it is missing or incomplete."""
    out_dir = Path(out_dir)
    try:
        m = json.loads((out_dir / MANIFEST).read_text(encoding="utf-8"))
        lines = (out_dir / QUESTIONS).read_text(encoding="utf-8").splitlines()
    except (OSError, ValueError) as exc:
        raise ValueError(f"no complete corpus in {out_dir} (got {exc})") from exc
    if m.get("generator_version") != GENERATOR_VERSION:
        raise ValueError(f"corpus in {out_dir} has generator version {m.get('generator_version')} "
                         f"(got it, need {GENERATOR_VERSION})")
    docs = tuple(CorpusDoc(**d) for d in m["docs"])
    questions = tuple(CorpusQuestion(**json.loads(x)) for x in lines if x.strip())
    return Corpus(out_dir, m["n_docs"], m["seed"], docs, questions, tuple(m["pdf_files"]))


def ensure_corpus(out_dir: Path | str, n_docs: int, seed: int = 0, pdf_sample: int = 0) -> Corpus:
    """Reuse the corpus in ``out_dir`` when it has the same settings, else (re)write it."""
    try:
        corpus = load_corpus(out_dir)
        if (corpus.n_docs, corpus.seed, len(corpus.pdf_files)) == (n_docs, seed, pdf_sample):
            return corpus
    except ValueError:
        pass
    return write_corpus(out_dir, n_docs, seed, pdf_sample, overwrite=True)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description="Write a synthetic contract folder for the scale benchmarks.")
    ap.add_argument("out_dir", type=Path)
    ap.add_argument("--docs", type=int, required=True, help="number of documents (e.g. 100, 1000, 5000)")
    ap.add_argument("--seed", type=int, default=0)
    ap.add_argument("--pdf-sample", type=int, default=0, help="also write the first M documents as PDFs")
    ap.add_argument("--overwrite", action="store_true", help="replace a corpus this script wrote before")
    args = ap.parse_args(argv)
    try:
        corpus = write_corpus(args.out_dir, args.docs, args.seed, args.pdf_sample, args.overwrite)
    except ValueError as exc:
        print(f"error: {exc}", file=sys.stderr)
        return 2
    print(f"wrote {corpus.n_docs} documents, {corpus.n_pages} pages, {len(corpus.questions)} questions, "
          f"{len(corpus.pdf_files)} PDFs under {corpus.root}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
