"""Search tokens for contract text (BM25 input).

``tokenize_for_search`` is a deterministic pure function:

1. Unicode NFKC, soft hyphens / zero-width characters removed, curly apostrophes -> "'", lowercase.
2. Tokens, left to right:
   - money ``$200,000`` / ``€1.500``-style amounts with a currency sign: the bare amount ("200000") *and* the
     sign-prefixed amount ("$200000"); commas are dropped and an all-zero decimal part (".00") is dropped;
   - percentages ``5%``: "5" and "5%";
   - numbers: "2,450,000" -> "2450000"; integers lose leading zeros ("07" -> "7"); decimals / dotted section
     numbers are kept as written ("9.2", "14.2.1"); ordinal suffixes are dropped ("30th" -> "30");
   - section references with parenthesised parts, e.g. "14.2(b)(ii)": every prefix is emitted —
     "14.2", "14.2(b)", "14.2(b)(ii)" — so a question about "section 14.2" finds all of its sub-clauses while
     "14.2(b)" matches that sub-clause most strongly;
   - words (letters only): contractions are expanded ("won't" -> "will" + "not", "cannot" -> "can" + "not"),
     a possessive "'s" is dropped, other apostrophes are removed; stopwords are dropped; the rest is stemmed
     with nltk's PorterStemmer (pure code, no data download).
3. Tokens longer than ``MAX_TOKEN_CHARS`` are dropped (base64 blobs, garbled PDF text).

Defined terms ("Effective Date") get no special treatment: they become their stemmed words.
"""

from __future__ import annotations

import re
import unicodedata
from functools import lru_cache

MAX_TOKEN_CHARS = 64

# The list of nltk's English stopwords (classic 179-word list), copied (from memory).
_NLTK_ENGLISH_STOPWORDS = frozenset(
    """
    i me my myself we our ours ourselves you you're you've you'll you'd your yours yourself yourselves he him
    his himself she she's her hers herself it it's its itself they them their theirs themselves what which who
    whom this that that'll these those am is are was were be been being have has had having do does did doing a
    an the and but if or because as until while of at by for with about against between into through during
    before after above below to from up down in out on off over under again further then once here there when
    where why how all any both each few more most other some such no nor not only own same so than too very s t
    can will just don don't should should've now d ll m o re ve y ain aren aren't couldn couldn't didn didn't
    doesn doesn't hadn hadn't hasn hasn't haven haven't isn isn't ma mightn mightn't mustn mustn't needn
    needn't shan shan't shouldn shouldn't wasn wasn't weren weren't won won't wouldn wouldn't
    """.split()
)

# Words that change a clause's meaning (negation, quantifiers, time limits, conditions): kept even though
# they are on the list above. The first group was asked for by the project; the second is this module's
# own choice (no source).
CONTRACT_KEEP_WORDS = frozenset(
    "not no nor any all each until before after against within without under".split()
    + "during only more most than between over above below".split()
)

STOPWORDS: frozenset[str] = _NLTK_ENGLISH_STOPWORDS - CONTRACT_KEEP_WORDS

_CONTRACTIONS = {"won't": "will", "can't": "can", "shan't": "shall", "ain't": "is", "cannot": "can"}

_DROP_CHARS = dict.fromkeys(map(ord, "\u00ad\u200b\u200c\u200d\u2060\ufeff"), None)
_DROP_CHARS.update({ord("\u2019"): "'", ord("\u2018"): "'", ord("\u02bc"): "'"})

_INT_WITH_COMMAS = r"\d{1,3}(?:,\d{3})+"
_TOKEN_RE = re.compile(
    rf"""
      (?P<money>(?P<cur>[$€£¥])\s?(?P<amount>(?:{_INT_WITH_COMMAS}|\d+)(?:\.\d+)?))
    | (?P<ref>\d+(?:\.\d+)*(?:\([a-z0-9]{{1,5}}\))+)
    | (?P<num>{_INT_WITH_COMMAS}(?:\.\d+)?|\d+(?:\.\d+)*)
        (?:(?P<pct>\s?%)|(?:st|nd|rd|th)(?![^\W_]))?
    | (?P<word>[^\W\d_]+(?:'[^\W\d_]+)*)
    """,
    re.VERBOSE,
)
_REF_PART_RE = re.compile(r"\([a-z0-9]{1,5}\)")


@lru_cache(maxsize=1)
def _stemmer():
    """nltk's PorterStemmer, imported on first use: importing nltk costs over a second, which start-up need not pay."""
    from nltk.stem import PorterStemmer

    return PorterStemmer()


@lru_cache(maxsize=200_000)
def _stem(word: str) -> str:
    return _stemmer().stem(word, to_lowercase=False)


def _normalise_amount(raw: str) -> str:
    """'2,450,000.00' -> '2450000'; '1,250.50' -> '1250.50'; '007' -> '7'."""
    digits = raw.replace(",", "")
    whole, dot, frac = digits.partition(".")
    whole = whole.lstrip("0") or "0"
    if dot and frac.strip("0"):
        return f"{whole}.{frac}"
    return whole


def _normalise_number(raw: str) -> str:
    """Comma groups and plain integers are amounts; dotted numbers (9.2, 14.2.1) are kept as written."""
    if "," in raw or "." not in raw:
        return _normalise_amount(raw)
    return raw


def _word_tokens(word: str) -> list[str]:
    negated = False
    if word in _CONTRACTIONS:
        word, negated = _CONTRACTIONS[word], True
    elif word.endswith("n't"):
        word, negated = word[:-3], True
    elif word.endswith("'s"):
        word = word[:-2]
    word = word.replace("'", "")
    out = []
    if word and word not in STOPWORDS:
        out.append(_stem(word))
    if negated:
        out.append("not")
    return out


def tokenize_for_search(text: str) -> list[str]:
    """Lowercased, stemmed, stopword-filtered tokens of ``text`` (see the module docstring for the rules)."""
    if not isinstance(text, str):
        raise ValueError(f"text must be a str (got {type(text).__name__})")
    text = unicodedata.normalize("NFKC", text).translate(_DROP_CHARS).lower()
    tokens: list[str] = []
    for m in _TOKEN_RE.finditer(text):
        if m.group("money") is not None:
            amount = _normalise_amount(m.group("amount"))
            tokens += [amount, m.group("cur") + amount]
        elif m.group("ref") is not None:
            ref = m.group("ref")
            base_end = ref.index("(")
            tokens.append(_normalise_number(ref[:base_end]))
            for part in _REF_PART_RE.finditer(ref, base_end):
                tokens.append(ref[: part.end()])
        elif m.group("num") is not None:
            number = _normalise_number(m.group("num"))
            tokens.append(number)
            if m.group("pct") is not None:
                tokens.append(number + "%")
        else:
            tokens += _word_tokens(m.group("word"))
    return [t for t in tokens if len(t) <= MAX_TOKEN_CHARS]


TITLE_MAX_WORDS = 12  # a longer first line is a sentence, not a title (no source: a common-sense bound)


def document_title(first_passage_text: str) -> str:
    """The document's title: the first non-blank line of its first passage, if that line has 1 to
    ``TITLE_MAX_WORDS`` words, a letter, and does not end like a sentence (. ; :); else "".

    "MUTUAL NONDISCLOSURE AGREEMENT\n\nThis Mutual ..." -> "MUTUAL NONDISCLOSURE AGREEMENT".
    """
    if not isinstance(first_passage_text, str):
        raise ValueError(f"first_passage_text must be a str (got {type(first_passage_text).__name__})")
    line = next((x.strip() for x in first_passage_text.splitlines() if x.strip()), "")
    words = line.split()
    if not 1 <= len(words) <= TITLE_MAX_WORDS or not any(c.isalpha() for c in line) or line[-1] in ".;:":
        return ""
    return line


_PATH_SEPARATORS_RE = re.compile(r"[\\/_\-.+]+")
_CAMEL_BOUNDARY_RE = re.compile(r"(?<=[a-z])(?=[A-Z])")


def path_search_tokens(rel_path: str) -> list[str]:
    """Search tokens of a document's folder and file names, extension dropped.

    "leases/Land_Lease-2024.pdf" -> tokens of "leases Land Lease 2024" (``_ - . + /`` and camelCase boundaries
    split words). BM25 adds them to every passage of the document, so "the land lease" finds that file.
    """
    if not isinstance(rel_path, str):
        raise ValueError(f"rel_path must be a str (got {type(rel_path).__name__})")
    parts = rel_path.replace("\\", "/").split("/")
    stem = parts[-1].rsplit(".", 1)[0] if "." in parts[-1].lstrip(".") else parts[-1]
    words = " ".join([*parts[:-1], stem])
    return tokenize_for_search(_CAMEL_BOUNDARY_RE.sub(" ", _PATH_SEPARATORS_RE.sub(" ", words)))
