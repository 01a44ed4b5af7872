"""Invented contract clauses with short extractive questions, as SQuAD-v2 JSON, for fine-tuning the reader.

Every party, place and value is invented training data. Invariants:
- for every answer, ``context[answer_start:answer_start + len(text)] == text`` (SQuAD offsets convention);
- an answer lies inside the clause it was drawn from, even when the same text occurs twice in a window;
- unanswerable questions (about 20%) carry ``is_impossible=True`` and ``answers=[]`` (SQuAD 2.0 convention);
- the same ``(n_windows, seed)`` always gives the same JSON (one ``random.Random(seed)``, no set ordering).
"""

from __future__ import annotations

import gzip
import json
import random
import re
import sys
from dataclasses import dataclass

P_IMPOSSIBLE = 0.2  # share of unanswerable questions (project choice)

_ONES = ("zero one two three four five six seven eight nine ten eleven twelve thirteen fourteen fifteen "
         "sixteen seventeen eighteen nineteen").split()
_TENS = "_ _ twenty thirty forty fifty sixty seventy eighty ninety".split()
_MONTHS = "January February March April May June July August September October November December".split()


def number_words(n: int) -> str:
    """English words for 0 <= n < 10**12, e.g. 245 -> 'two hundred forty-five'."""
    if not isinstance(n, int) or n < 0 or n >= 10**12:
        raise ValueError(f"n must be an int in [0, 10**12) (got {n!r})")
    if n < 20:
        return _ONES[n]
    if n < 100:
        return _TENS[n // 10] + (f"-{_ONES[n % 10]}" if n % 10 else "")
    if n < 1000:
        return f"{_ONES[n // 100]} hundred" + (f" {number_words(n % 100)}" if n % 100 else "")
    for div, name in ((10**9, "billion"), (10**6, "million"), (1000, "thousand")):
        if n >= div:
            head, rest = divmod(n, div)
            return f"{number_words(head)} {name}" + (f" {number_words(rest)}" if rest else "")
    raise AssertionError("unreachable")


# ---------------------------------------------------------------- value makers (r: Random, c: agreement dict)
def _count(r: random.Random, n: int, unit: str) -> str:
    u = unit[:-1] if n == 1 and unit.endswith("s") else unit
    x = r.random()
    return f"{number_words(n)} ({n}) {u}" if x < 0.55 else f"{n} {u}" if x < 0.9 else f"{number_words(n)} {u}"


def _dur(r, c, ns, unit="days"):
    """A duration; days sometimes repeat the agreement's 'echo' text so one window holds the same value twice."""
    if unit == "days" and r.random() < 0.25:
        return c["echo"]
    return _count(r, r.choice(ns), unit)


def _years_or_months(r, c, years, months):
    return _dur(r, c, years, "years") if r.random() < 0.5 else _dur(r, c, months, "months")


def _money(r, lo: int, hi: int) -> str:
    n = r.randint(lo, hi)
    step = 10 ** max(0, len(str(n)) - 3)
    n = max(step, n // step * step)
    d, x = f"{n:,}", r.random()
    if x < 0.40:
        return f"${d}"
    if x < 0.52:
        return f"USD {d}"
    if x < 0.70:
        return f"{number_words(n)} dollars (${d})"
    if x < 0.78 and n >= 10**6 and n % 100_000 == 0:
        return f"${n / 10**6:g} million"
    return r.choice((f"EUR {d}", f"€{d}", f"£{d}", f"US${d}", f"CAD {d}"))


def _pct(r, ns) -> str:
    n = r.choice(ns)
    if isinstance(n, float) or r.random() < 0.4:
        return f"{n}%"
    return f"{number_words(n)} percent ({n}%)"


def _date(r) -> str:
    y, m, d = r.randint(2014, 2028), r.randint(1, 12), r.randint(1, 28)
    suffix = "th" if 10 < d < 14 else {1: "st", 2: "nd", 3: "rd"}.get(d % 10, "th")
    return r.choice((f"{_MONTHS[m - 1]} {d}, {y}", f"{_MONTHS[m - 1]} {d}, {y}", f"{d} {_MONTHS[m - 1]} {y}",
                     f"the {d}{suffix} day of {_MONTHS[m - 1]}, {y}", f"{m:02d}/{d:02d}/{y}"))


_SYL1 = ("Lark Quil Brack Tam Oak Vir Cor Hal Sable North Fern Mer Gray Pell Ash Wren Thorn Ald Bram Cald Dun "
         "Elm Fal Glen Hol Ivor Kel Lom Marl Nor Ost Pim Rook Sel Tor Ulm Vesp Wil Yar Zen").split()
_SYL2 = "spur ton ridge wick hollow eo vane berd wood mere castle dale fen ora by stead mont ley holt brook".split()
_WORD2 = "Grid Harbor Ledger Foundry Signal Orchard Vector Lantern Summit Meadow Granite Tidewater Copper".split()
_TRADE = ("Services Logistics Analytics Holdings Systems Manufacturing Partners Technologies Energy Biologics "
          "Freight Robotics Materials Foods Health Capital Software").split()
_SUFFIX = "Inc.|LLC|Ltd.|Cooperative|GmbH|Corporation|LLP|plc|Pty Ltd|S.A.|B.V.|Co.".split("|")
_PLACE = "Ashcombe Bellmoor Carrow Dunhaven Eastwick Fallowmere Greyling Harrowgate Kestwell Millbrook".split()
_REGIONS = ("Oregon", "Delaware", "Texas", "Ontario", "Scotland", "Varenna", "Ostravia", "New South Wales")
_STREET = "Quarry Lane|Harbor Road|Foundry Street|Orchard Avenue|Mill Way|Station Parade|Copper Drive".split("|")


def _company(r) -> str:
    first = r.choice(_SYL1) + r.choice(_SYL2)
    mid = f" {r.choice(_WORD2)}" if r.random() < 0.5 else ""
    return f"{first}{mid} {r.choice(_TRADE)} {r.choice(_SUFFIX)}"


def _address(r) -> str:
    return f"{r.randint(2, 980)} {r.choice(_STREET)}, {r.choice(_PLACE)}" + r.choice(("", f", {r.choice(_REGIONS)}"))


# (governing law, place adjective, courts)
_JUR = [
    ("the laws of the State of Delaware", "Delaware", "the state and federal courts located in Wilmington, Delaware"),
    ("the laws of the State of New York", "New York", "the state and federal courts sitting in the Borough of Manhattan"),
    ("the laws of the State of Oregon", "Oregon", "the courts of Multnomah County, Oregon"),
    ("the laws of the State of Texas", "Texas", "the state and federal courts located in Travis County, Texas"),
    ("the laws of the State of Illinois", "Illinois", "the courts of Cook County, Illinois"),
    ("the laws of the Commonwealth of Massachusetts", "Massachusetts", "the courts of Suffolk County, Massachusetts"),
    ("the laws of England and Wales", "English", "the courts of England and Wales"),
    ("the laws of Scotland", "Scottish", "the Court of Session in Edinburgh"),
    ("the laws of the Province of Ontario", "Ontario", "the courts of the Province of Ontario sitting in Toronto"),
    ("the laws of Singapore", "Singapore", "the courts of the Republic of Singapore"),
    ("the laws of Ireland", "Irish", "the courts of Ireland"),
    ("the laws of the State of New South Wales", "New South Wales", "the courts of New South Wales"),
    ("the laws of the Republic of Ostravia", "Ostravian", "the Commercial Court of Veldmark"),
    ("the laws of the Commonwealth of Varenna", "Varennan", "the High Court of Varenna"),
]
_AGREEMENTS = [  # (title, short name, role A (is paid), role B (pays), subject, fee labels (label, lo, hi))
    ("Master Services Agreement", "Agreement", "Provider", "Customer", "Services",
     [("monthly service fee", 5000, 400000), ("implementation fee", 20000, 900000)]),
    ("Supply Agreement", "Agreement", "Supplier", "Buyer", "Products",
     [("minimum annual purchase commitment", 250000, 9000000), ("tooling charge", 10000, 300000)]),
    ("Software License Agreement", "Agreement", "Licensor", "Licensee", "Licensed Software",
     [("annual license fee", 15000, 2500000), ("support and maintenance fee", 3000, 500000)]),
    ("Equipment Lease", "Lease", "Lessor", "Lessee", "Equipment",
     [("monthly rent", 1500, 90000), ("end-of-term purchase price", 10000, 900000)]),
    ("Office Lease", "Lease", "Landlord", "Tenant", "Premises",
     [("Base Rent", 4000, 250000), ("Security Deposit", 10000, 500000)]),
    ("Distribution Agreement", "Agreement", "Manufacturer", "Distributor", "Products",
     [("distribution fee", 20000, 800000), ("annual marketing contribution", 5000, 300000)]),
    ("Consulting Agreement", "Agreement", "Consultant", "Client", "Deliverables",
     [("daily rate", 800, 6000), ("fixed project fee", 25000, 1500000), ("monthly retainer", 3000, 60000)]),
    ("Logistics Services Agreement", "Agreement", "Carrier", "Shipper", "Services",
     [("monthly minimum charge", 5000, 200000), ("per-pallet storage rate", 10, 90)]),
    ("Research Collaboration Agreement", "Agreement", "Institution", "Sponsor", "Research Program",
     [("research funding", 100000, 5000000), ("milestone payment", 50000, 2000000)]),
]
_ABSENT_ROLES = ("Guarantor", "Escrow Agent", "Subcontractor", "Sales Agent", "Sublessee", "Administrative Agent")
_INS = ("commercial general liability insurance", "professional liability insurance", "cyber liability insurance",
        "product liability insurance", "automobile liability insurance", "employer's liability insurance")
_TRIGGERS = ("becomes insolvent", "files a voluntary petition in bankruptcy",
             "makes a general assignment for the benefit of its creditors",
             "has a receiver appointed over all or substantially all of its assets",
             "ceases to carry on business in the ordinary course", "enters into compulsory liquidation")
_SCOPES = ("infringement of any third-party intellectual property right", "bodily injury or death caused by its negligence",
           "its breach of applicable data protection laws", "its gross negligence or wilful misconduct",
           "damage to tangible property caused by its personnel", "any violation of applicable export control laws")
_CONSENT = ("which consent shall not be unreasonably withheld", "not to be unreasonably withheld, conditioned or delayed",
            "which may be granted or withheld in its sole discretion", "such consent not to be unreasonably withheld or delayed",
            "which may be withheld in its absolute discretion")
_INTEREST = ("1.5% per month", "one and one-half percent (1.5%) per month", "eight percent (8%) per annum",
             "the prime rate plus two percent (2%)", "12% per annum", "4% per annum above the base rate",
             "the lesser of 1% per month and the highest lawful rate")


def _gen(r: random.Random, c: dict) -> dict:
    """All slot values of one agreement (each drawn once, so windows of one agreement agree)."""
    fee = r.choice(c["fees"])
    ins = r.sample(_INS, 3)
    cap = r.choice((_money(r, 50000, 10000000), _money(r, 50000, 10000000),
                    f"{r.choice((100, 125, 150, 200))}% of the Fees paid in the twelve (12) months preceding the claim",
                    f"the total Fees paid or payable by the {c['B']} in the {r.choice(('six (6)', 'twelve (12)'))} months"
                    " preceding the event giving rise to the claim", f"{r.choice(('two (2)', 'three (3)'))} times the annual Fees"))
    return {
        "party_a": c["name_a"], "party_b": c["name_b"], "eff_date": _date(r), "absent_role": "",
        "form_a": c["form_a"], "form_b": c["form_b"], "addr_b": _address(r),
        "term_len": _years_or_months(r, c, (1, 2, 3, 4, 5, 7, 10), (12, 18, 24, 36, 48, 60)),
        "renew_len": _years_or_months(r, c, (1, 1, 2, 3), (6, 12, 24)),
        "nonrenew_notice": _dur(r, c, (30, 45, 60, 90, 120, 180)),
        "conv_notice": _dur(r, c, (30, 45, 60, 90, 120, 180)),
        "cure": _dur(r, c, (5, 10, 15, 20, 30, 45, 60)) if r.random() < 0.8 else _count(r, r.choice((5, 10, 15)), "business days"),
        "trigger": r.choice(_TRIGGERS),
        "pay_net": f"Net {r.choice((10, 15, 30, 45, 60, 75, 90))}",
        "pay_terms": r.choice(("within {} of receipt of an undisputed invoice", "within {} after the invoice date",
                               "no later than {} after receipt of a correct invoice", "within {} of the date of invoice"))
        .format(_dur(r, c, (10, 14, 15, 30, 45, 60, 90))),
        "interest": r.choice(_INTEREST), "fee_label": fee[0], "fee": _money(r, fee[1], fee[2]),
        "increase": _pct(r, (2, 3, 4, 5, 2.5, 3.5, 7)), "cap": cap, "indem_scope": r.choice(_SCOPES),
        "claim_notice": _count(r, r.choice((5, 10, 15, 30)), r.choice(("days", "business days"))),
        "conf_survival": _years_or_months(r, c, (2, 3, 5, 7, 10), (24, 36, 60)),
        "return_period": _dur(r, c, (5, 10, 14, 15, 30)), "law": c["jur"][0], "forum": c["jur"][2],
        "assign_std": r.choice(_CONSENT), "coc_threshold": r.choice(("fifty percent (50%)", "50%", "a majority",
                                                                        "thirty-five percent (35%)", "forty percent (40%)")),
        "coc_notice": _count(r, r.choice((5, 10, 15, 30)), r.choice(("days", "business days"))),
        "warranty": _years_or_months(r, c, (1, 2, 3), (3, 6, 12, 18, 24, 36)),
        "ins_t1": ins[0], "ins_t2": ins[1], "ins_t3": ins[2], "absent_ins": "",
        "ins1": _money(r, 1000000, 10000000), "ins2": _money(r, 500000, 5000000),
        "deliv_loc": r.choice((f"the {c['B']}'s warehouse at ", "the Delivery Site at ", "")) + _address(r),
        "deliv_time": _dur(r, c, (7, 10, 14, 21, 30, 45, 60)), "notice_addr": _address(r),
        "att": r.choice(("General Counsel", "Legal Department", "Chief Financial Officer", "Contracts Manager")),
        "deemed": r.choice(("three (3) business days", "two (2) Business Days", "five days", "48 hours", "3 business days")),
        "audit_freq": r.choice(("once per calendar year", "once in any twelve (12) month period", "twice per year",
                                "once per Contract Year")),
        "audit_threshold": _pct(r, (3, 5, 10)), "audit_notice": _dur(r, c, (10, 15, 30, 45)),
        "nonsolicit": _years_or_months(r, c, (1, 2), (6, 12, 18, 24)), "fm_period": _dur(r, c, (30, 45, 60, 90, 120)),
    }


from engine.training.synth_templates import _FILLERS, _KINDS, _NEAR  # noqa: E402

_FIELD = re.compile(r"\{(\w+)(?::(\w+))?\}")
_CURLY = re.compile(r'"([^"{}]*)"')


@dataclass(frozen=True)
class SynthClause:
    """One clause of a window: ``context[start:end]`` is its numbered text."""

    kind: str
    start: int
    end: int


@dataclass(frozen=True)
class SynthQuestion:
    """``answer`` is None for an unanswerable question, else (text, start) with context[start:start+len(text)] == text."""

    qid: str
    question: str
    kind: str
    slot: str
    answer: tuple[str, int] | None


@dataclass(frozen=True)
class SynthWindow:
    title: str
    context: str
    clauses: tuple[SynthClause, ...]
    questions: tuple[SynthQuestion, ...]
    filled: tuple[str, ...]  # answer slots present in the context


def _render(template: str, values: dict) -> tuple[str, dict[str, tuple[int, str]]]:
    """Fill ``{name}`` fields; return the text and, per field, (where its value starts, the value)."""
    upper = template.startswith("^")
    template = template.lstrip("^")
    out, starts, n, pos = [], {}, 0, 0
    for m in _FIELD.finditer(template):
        lit = template[pos:m.start()]
        out += [lit.upper() if upper else lit, values[m.group(2) or m.group(1)]]
        starts.setdefault(m.group(1), (n + len(lit), out[-1]))
        n += len(lit) + len(out[-1])
        pos = m.end()
    out.append(template[pos:].upper() if upper else template[pos:])
    return "".join(out), starts


def _agreement(r: random.Random) -> dict:
    title, agr, a, b, thing, fees = r.choice(_AGREEMENTS)
    jur = r.choice(_JUR)
    name_a, name_b = _company(r), _company(r)
    while name_b == name_a:
        name_b = _company(r)

    def form() -> str:
        adj = r.choice(_JUR)[1] if r.random() < 0.4 else jur[1]
        kind = r.choice(("corporation", "limited liability company", "company", "cooperative society"))
        return f"{'an' if adj[0] in 'AEIOU' else 'a'} {adj} {kind}"

    c = {"Title": title, "TITLE": title.upper(), "Agr": agr, "A": a, "B": b, "Thing": thing, "fees": fees,
         "jur": jur, "name_a": name_a, "name_b": name_b, "form_a": form(), "form_b": form(),
         "absent": r.choice(_ABSENT_ROLES), "curly": r.random() < 0.35, "section": r.randint(2, 24)}
    c["echo"] = _count(r, r.choice((10, 15, 30, 45, 60, 90)), "days")
    c["vals"] = _gen(r, c)
    return c


def _number(r: random.Random, style: int, sec: int, i: int) -> str:
    return (f"{sec}.{i} ", f"Section {sec}.{i}. ", f"{sec + i}. ", f"({'abcdefghijklmnop'[i - 1]}) ", f"Clause {sec}.{i} ",
            f"{sec}.{i}({'abcdefghijklmnop'[i - 1]}) ")[style]


def _window(r: random.Random, c: dict, widx: int, prefix: str) -> SynthWindow:
    kinds = r.sample(sorted(k for k in _KINDS if k != "parties"), r.randint(2, 5))
    if r.random() < 0.2:
        kinds[0] = "parties"
    section = c["section"] + r.randint(0, 6)
    vals = {**c, **c["vals"]}
    bodies: list[tuple[str, str, dict]] = []  # (kind, body, {slot: (start in body, value)})
    for k in kinds:
        vals["xref"] = r.choice((f"Section {r.randint(2, 24)}.{r.randint(1, 9)}", f"Clause {r.randint(2, 24)}.{r.randint(1, 9)}",
                                 f"Section {r.randint(2, 24)}.{r.randint(1, 9)}({r.choice('abcd')})", f"Article {r.randint(2, 16)}"))
        tpl = r.choice(_KINDS[k][1])
        if c["curly"]:
            tpl = _CURLY.sub("\u201c\\1\u201d", tpl)
        text, starts = _render(tpl, vals)
        bodies.append((k, text, {s: p for s, p in starts.items() if s in _KINDS[k][2]}))
    words = lambda: sum(len(b[1].split()) for b in bodies)  # noqa: E731
    fill = list(_FILLERS)
    r.shuffle(fill)
    while (words() < 120 or (len(bodies) < 6 and r.random() < 0.3)) and fill:
        head, tpl = fill.pop()
        text, _ = _render(tpl, {**vals, "n1": str(r.randint(2, 9)), "n2": str(r.randint(10, 15)), "n3": str(r.randint(16, 24))})
        bodies.insert(r.randint(1 if bodies[0][0] == "parties" else 0, len(bodies)), ("filler:" + head, text, {}))
    while words() > 220 and len(bodies) > 3:
        bodies.pop()
    style, sep, heads = r.randrange(6), r.choice(("\n", "\n\n", " ")), r.random() < 0.6
    parts, clauses, n, i = [], [], 0, 0
    for k, text, _ in bodies:
        if k == "parties":
            num = ""
        else:
            i += 1
            head = k[7:] if k.startswith("filler:") else r.choice(_KINDS[k][0])
            num = _number(r, style, section, i) + (f"{head.upper() if r.random() < 0.3 else head}. " if heads else "")
        start = n + (len(sep) if parts else 0)
        parts.append(num + text)
        clauses.append(SynthClause(k, start, start + len(num) + len(text)))
        n = clauses[-1].end
    context = sep.join(parts)
    spots = {}  # slot -> (kind, answer start in context, answer text)
    for (k, text, starts), cl in zip(bodies, clauses):
        for s, p in starts.items():
            spots[s] = (k, cl.end - len(text) + p[0], p[1])
    return SynthWindow(c["Title"] + " - " + c["name_a"], context, tuple(clauses),
                       _questions(r, c, vals, context, spots, [b[0] for b in bodies], widx, prefix), tuple(sorted(spots)))


def _questions(r, c, vals, context, spots, present, widx, prefix) -> tuple[SynthQuestion, ...]:
    kinds_in = [k for k in present if k in _KINDS]
    missing_in = [(k, s) for k in kinds_in for s in _KINDS[k][2] if s not in spots]  # near misses inside a clause
    absent = [(k, s) for k in _KINDS if k not in kinds_in for s in _KINDS[k][2] if not s.startswith("absent_")]
    near = [(k, s) for k, s in absent if any(k in _NEAR.get(p, "").split() for p in kinds_in)]
    asked, out = set(), []
    for j in range(r.randint(1, 4)):
        if r.random() < P_IMPOSSIBLE or not [s for s in spots if s not in asked]:
            x = r.random()
            pool = [p for p in (missing_in if x < 0.3 else near if x < 0.8 else absent) if p[1] not in asked] or \
                [p for p in absent if p[1] not in asked]
            kind, slot = r.choice(pool)
            answer = None
        else:
            slot = r.choice(sorted(s for s in spots if s not in asked))
            kind, start, text = spots[slot]
            answer = (text, start)
            assert context[start:start + len(answer[0])] == answer[0], (slot, context)
        asked.add(slot)
        q = r.choice(_KINDS[kind][2][slot].split("|"))
        q = _FIELD.sub(lambda m: str(vals[m.group(1)]), q)
        x = r.random()
        q = q.lower().rstrip("?") if x < 0.12 else q.rstrip("?") if x < 0.2 else q
        out.append(SynthQuestion(f"{prefix}-{widx:06d}-{j}", q, kind, slot, answer))
    return tuple(out)


def generate_windows(n_windows: int, seed: int = 0) -> list[SynthWindow]:
    """``n_windows`` windows; each invented agreement contributes 1-3 consecutive windows."""
    if not isinstance(n_windows, int) or isinstance(n_windows, bool) or n_windows < 1:
        raise ValueError(f"n_windows must be a positive int (got {n_windows!r})")
    if not isinstance(seed, int) or isinstance(seed, bool):
        raise ValueError(f"seed must be an int (got {seed!r})")
    r, out = random.Random(seed), []
    while len(out) < n_windows:
        c = _agreement(r)
        for _ in range(min(r.randint(1, 3), n_windows - len(out))):
            out.append(_window(r, c, len(out), f"syn{seed}"))
    return out


def generate_squad(n_windows: int, seed: int = 0) -> dict:
    """SQuAD-v2 JSON; one data entry per invented agreement, one paragraph per window."""
    data: list[dict] = []
    for w in generate_windows(n_windows, seed):
        qas = [{"id": q.qid, "question": q.question, "is_impossible": q.answer is None,
                "answers": [] if q.answer is None else [{"text": q.answer[0], "answer_start": q.answer[1]}]}
               for q in w.questions]
        for q in qas:
            for a in q["answers"]:
                assert w.context[a["answer_start"]:a["answer_start"] + len(a["text"])] == a["text"]
        if not data or data[-1]["title"] != w.title:
            data.append({"title": w.title, "paragraphs": []})
        data[-1]["paragraphs"].append({"context": w.context, "qas": qas})
    return {"version": "synthetic-contracts-1", "data": data}


def main(argv: list[str] | None = None) -> int:
    """``python -m engine.training.synth_contracts OUT.json.gz N SEED`` writes gzip JSON."""
    args = sys.argv[1:] if argv is None else argv
    if len(args) != 3:
        print("usage: python -m engine.training.synth_contracts OUT.json.gz N SEED", file=sys.stderr)
        return 2
    squad = generate_squad(int(args[1]), int(args[2]))
    with gzip.open(args[0], "wt", encoding="utf-8") as f:
        json.dump(squad, f, ensure_ascii=False)
    n_q = sum(len(p["qas"]) for d in squad["data"] for p in d["paragraphs"])
    print(f"wrote {args[0]}: {args[1]} windows, {n_q} questions")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
