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


# ---------------------------------------------------------------- clause kinds
# kind: (headings, templates, {slot: "question|question|..."}). "{slot}" marks an answer; "{x:y}" renders value y
# as slot x; a leading "^" upper-cases the template's literal text. Slots named absent_* are never in any clause.
_KINDS: dict[str, tuple[tuple[str, ...], tuple[str, ...], dict[str, str]]] = {
    "parties": (("",), (
        'This {Title} (this "{Agr}") is entered into as of {eff_date} (the "Effective Date") by and between {party_a}, {form_a} ("{A}"), and {party_b}, {form_b} ("{B}").',
        'THIS {TITLE} is made on {eff_date} BETWEEN: (1) {party_a}, {form_a} (the "{A}"); and (2) {party_b}, {form_b} (the "{B}"). The {A} and the {B} are each a "Party".',
        '{party_a} ("{A}") and {party_b} ("{B}") enter into this {Title}, effective {eff_date} (the "Effective Date"), on the terms set out below.',
        'This {Agr} is made effective as of {eff_date} by {party_b}, having its principal office at {addr_b} (the "{B}"), and {party_a} (the "{A}").'), {
        "party_a": "Who is the {A}?|Which company is the {A}?|What is the name of the {A}?|Who is the {A} under this {Agr}?|Which entity acts as {A}?|name of the {A}",
        "party_b": "Who is the {B}?|Which entity is the {B}?|What is the name of the {B}?|Who is the {B} under the {Agr}?|Which company acts as {B}?",
        "eff_date": "What is the effective date?|When does the {Agr} take effect?|As of what date is the {Agr} entered into?|On what date does this {Agr} become effective?|What is the Effective Date of the {Agr}?",
        "absent_role": "Who is the {absent}?|Which company acts as {absent}?|What is the name of the {absent}?"}),
    "term": (("Term", "Initial Term"), (
        'The initial term of this {Agr} shall commence on the Effective Date and continue for {term_len} (the "Initial Term"), unless terminated earlier in accordance with {xref}.',
        'This {Agr} shall remain in full force and effect for a period of {term_len} from the Effective Date (the "Initial Term").',
        'Unless earlier terminated as provided herein, the term of this {Agr} is {term_len}, commencing on the Commencement Date.',
        'Subject to {xref}, this {Agr} begins on the Effective Date and expires {term_len} thereafter.'), {
        "term_len": "What is the initial term of the {Agr}?|How long is the initial term?|For how long does the {Agr} remain in force?|What is the duration of the {Agr}?|How long does this {Agr} last?|What is the length of the Initial Term?|initial term length"}),
    "renewal": (("Renewal", "Automatic Renewal"), (
        'Thereafter, this {Agr} shall automatically renew for successive terms of {renew_len} each (each, a "Renewal Term"), unless either party gives written notice of non-renewal at least {nonrenew_notice} prior to the end of the then-current term.',
        'Upon expiry of the Initial Term, the {Agr} will renew automatically for additional periods of {renew_len} unless a party notifies the other in writing not less than {nonrenew_notice} before the expiry date that it does not wish to renew.',
        'The {B} may elect not to renew by delivering notice no later than {nonrenew_notice} before the end of the Initial Term; otherwise the term shall be extended by {renew_len}.',
        'This {Agr} renews automatically for consecutive {renew_len} periods unless terminated in accordance with {xref}.'), {
        "renew_len": "How long is each renewal term?|For what period does the {Agr} automatically renew?|What is the length of a Renewal Term?|By how long is the term extended on renewal?|renewal period length",
        "nonrenew_notice": "Within how many days must a party give notice of non-renewal?|How much notice is needed to prevent automatic renewal?|What is the non-renewal notice period?|How far in advance must notice of non-renewal be given?|How much notice must be given to avoid renewal?"}),
    "term_conv": (("Termination for Convenience", "Termination Without Cause"), (
        "Either party may terminate this {Agr} for convenience upon {conv_notice}' prior written notice to the other party.",
        'The {B} may terminate this {Agr} at any time without cause by giving the {A} not less than {conv_notice} prior written notice.',
        'Notwithstanding {xref}, the {A} may terminate this {Agr} without cause on no less than {conv_notice} written notice, provided that all undisputed Fees accrued through the termination date are paid.',
        'Either party may end this {Agr} for any reason or no reason by written notice delivered at least {conv_notice} before the intended termination date.'), {
        "conv_notice": "How much notice is required to terminate the {Agr} for convenience?|What is the termination notice period?|How much prior written notice must be given to terminate without cause?|How many days' notice is needed to terminate for convenience?|What notice period applies to termination without cause?|notice period to terminate for convenience"}),
    "cure": (("Termination for Breach", "Default"), (
        'Either party may terminate this {Agr} upon written notice if the other party materially breaches this {Agr} and fails to cure such breach within {cure} after receipt of written notice thereof.',
        'If the {B} fails to pay any amount when due and does not remedy such failure within {cure} of notice, the {A} may suspend performance or terminate this {Agr}.',
        'In the event of a material breach, the non-breaching party shall give written notice describing the breach, and the breaching party shall have {cure} (the "Cure Period") to remedy it before termination may take effect.',
        'A party in material breach shall have a period of {cure} following written notice in which to cure; if the breach is not cured, the other party may terminate this {Agr} upon written notice.'), {
        "cure": "What is the cure period for a breach?|How long does the breaching party have to cure a breach?|Within what period must a breach be remedied?|How long is the cure period after notice of breach?|What is the Cure Period?|how long to cure a breach before termination"}),
    "insolvency": (("Insolvency", "Termination on Insolvency"), (
        'Either party may terminate this {Agr} immediately by written notice if the other party {trigger}.',
        'The {A} may terminate this {Agr} with immediate effect if the {B} {trigger}, or if any analogous event occurs in any jurisdiction.',
        'This {Agr} shall terminate automatically, without notice, in the event that either party {trigger}.'), {
        "trigger": "What insolvency-related event permits immediate termination?|Which financial-distress event lets a party terminate immediately?|What bankruptcy or insolvency trigger allows termination?|What event relating to a party's solvency ends the {Agr}?"}),
    "payment": (("Payment", "Invoicing and Payment"), (
        'All undisputed amounts are payable {pay_terms}. Invoices shall be issued monthly in arrears and shall reference the applicable Purchase Order.',
        'Payment terms are {pay_terms:pay_net} from the date of a correct and undisputed invoice. The {B} shall pay by wire transfer to the account designated by the {A}.',
        'The {A} will invoice the {B} quarterly in advance, and the {B} shall remit payment {pay_terms}.',
        'Except for amounts disputed in good faith under {xref}, each invoice is due and payable {pay_terms}.'), {
        "pay_terms": "What are the payment terms?|When are invoices due?|Within how many days must the {B} pay invoices?|How quickly must the {B} pay an invoice?|When is payment due under the {Agr}?|what are the payment terms for invoices"}),
    "late_interest": (("Late Payment", "Interest on Overdue Amounts"), (
        'Any amount not paid when due shall accrue interest at {interest}, or the maximum rate permitted by applicable law, if lower.',
        'Late payments bear interest at {interest} from the due date until paid in full, and the {B} shall reimburse the {A} for reasonable costs of collection.',
        'Overdue sums carry interest at {interest}, calculated daily from the due date until the date of actual payment.'), {
        "interest": "What interest rate applies to late payments?|What is the late payment interest rate?|At what rate does interest accrue on overdue amounts?|What interest is charged on unpaid invoices?|How much interest accrues on overdue sums?"}),
    "fees": (("Fees", "Charges"), (
        'In consideration of the {Thing}, the {B} shall pay to the {A} the {fee_label} of {fee}, exclusive of applicable taxes.',
        'The {fee_label} payable under this {Agr} is {fee}. Commencing on the first anniversary of the Effective Date, the {A} may increase the {fee_label} by no more than {increase} per Contract Year.',
        'The {B} agrees to pay {fee} as the {fee_label}, plus reimbursable expenses approved in advance in writing; fees may be adjusted annually by up to {increase}.',
        'The {fee_label} shall be {fee}, payable in accordance with {xref}. No price increase shall exceed {increase} in any twelve-month period.'), {
        "fee": "What is the {fee_label}?|How much is the {fee_label}?|What amount is payable as the {fee_label}?|How much must the {B} pay as the {fee_label}?|what is the {fee_label} amount",
        "increase": "By how much may the {fee_label} increase each year?|What is the maximum annual fee increase?|What is the cap on annual price increases?|How much can the {A} raise fees per year?"}),
    "liability": (("Limitation of Liability", "Liability Cap"), (
        "Except for liability arising from a party's gross negligence or wilful misconduct, in no event shall either party's aggregate liability arising out of or relating to this {Agr} exceed {cap}.",
        "The {A}'s total cumulative liability under this {Agr}, whether in contract, tort or otherwise, shall be limited to {cap}.",
        'Subject to {xref}, the maximum aggregate liability of each party for all claims under this {Agr} is {cap}. Neither party shall be liable for any indirect or consequential damages.',
        "^Notwithstanding anything to the contrary in this {Agr}, each party's total liability shall not exceed {cap} in the aggregate."), {
        "cap": "What is the cap on the {A}'s liability?|What is the limitation of liability amount?|What is the maximum aggregate liability under the {Agr}?|How much is liability capped at?|what is the liability cap|To what amount is each party's liability limited?"}),
    "indemnity": (("Indemnification",), (
        'The {A} shall defend, indemnify and hold harmless the {B} from and against all losses arising from {indem_scope}, provided that the {B} notifies the {A} of the claim within {claim_notice} of becoming aware of it.',
        'The {A} will indemnify the {B} against third-party claims arising from {indem_scope}. The indemnified party must give written notice of any such claim no later than {claim_notice} after receipt.',
        'Each party shall indemnify the other for losses resulting from {indem_scope}, subject to the procedures in {xref}.'), {
        "indem_scope": "What claims does the {A} indemnify against?|What is covered by the indemnity?|For what must the {A} indemnify the {B}?|What is the scope of the indemnification obligation?",
        "claim_notice": "How soon must an indemnified party notify of a claim?|What is the deadline to notify the indemnifying party of a claim?|Within what period must notice of an indemnifiable claim be given?|How quickly must the {B} notify the {A} of a third-party claim?"}),
    "confidentiality": (("Confidentiality", "Non-Disclosure"), (
        'The obligations in this Section shall survive termination or expiration of this {Agr} for {conf_survival}. Upon request, the receiving party shall return or destroy all Confidential Information within {return_period}.',
        """Each party shall hold the other party's "Confidential Information" in strict confidence during the term and for {conf_survival} thereafter, except that trade secrets shall be protected for as long as they remain trade secrets.""",
        'The receiving party shall not disclose Confidential Information to any third party other than its advisers bound by equivalent duties. These obligations continue for {conf_survival} following the termination of this {Agr}.',
        "Within {return_period} after termination, each party shall return or certify destruction of the other party's Confidential Information; the duty of confidentiality survives for {conf_survival}."), {
        "conf_survival": "How long do confidentiality obligations survive?|For how long after termination must Confidential Information be kept confidential?|What is the confidentiality survival period?|How long does the duty of confidentiality last after the {Agr} ends?|how long do the confidentiality obligations last after termination",
        "return_period": "Within how many days must Confidential Information be returned or destroyed?|How long does a party have to return Confidential Information?|What is the deadline for returning or destroying confidential materials?"}),
    "law": (("Governing Law",), (
        'This {Agr} shall be governed by and construed in accordance with {law}, without regard to its conflict of laws principles.',
        'This {Agr} and any non-contractual obligations arising out of or in connection with it are governed by {law}.',
        'The validity, interpretation and performance of this {Agr} shall be governed by {law}, and the United Nations Convention on Contracts for the International Sale of Goods shall not apply.'), {
        "law": "Which law governs this {Agr}?|What is the governing law?|Under which jurisdiction's laws is the {Agr} construed?|what law governs the agreement|Which laws apply to the interpretation of this {Agr}?|What governing law applies?"}),
    "venue": (("Jurisdiction", "Disputes"), (
        'Each party irrevocably submits to the exclusive jurisdiction of {forum} for any action arising out of this {Agr}.',
        'Any dispute arising under or in connection with this {Agr} shall be finally resolved by {forum}.',
        'Any suit relating to this {Agr} shall be brought only before {forum}, and the parties waive any objection based on inconvenient forum.'), {
        "forum": "Which courts have jurisdiction over disputes?|Where must disputes be brought?|What is the venue for disputes under the {Agr}?|Which forum has exclusive jurisdiction?|where are disputes resolved|What forum are disputes submitted to?"}),
    "assignment": (("Assignment",), (
        'Neither party may assign this {Agr} without the prior written consent of the other party, {assign_std}.',
        "The {B} shall not assign or transfer any rights under this {Agr} without the {A}'s prior written consent, {assign_std}; any purported assignment in violation of this Section is void.",
        'Except as permitted by {xref}, this {Agr} may not be assigned by either party without consent, {assign_std}, save to a successor in a merger or sale of substantially all assets.'), {
        "assign_std": "What standard applies to consent for assignment?|What is the consent standard for assignment?|How may consent to assignment be withheld?|What limit applies to withholding consent to an assignment?|what standard governs consent to assign this {Agr}"}),
    "coc": (("Change of Control",), (
        'A "Change of Control" means the acquisition by any person of more than {coc_threshold} of the voting securities of the {B}. The {B} shall notify the {A} of any Change of Control within {coc_notice}.',
        'If the {B} undergoes a Change of Control, it shall give the {A} written notice within {coc_notice} thereafter, and the {A} may terminate this {Agr} within ninety days of receiving such notice.',
        'For purposes of this {Agr}, a change of control occurs when a third party acquires beneficial ownership of {coc_threshold} or more of the outstanding equity of a party.'), {
        "coc_threshold": "What ownership threshold triggers a Change of Control?|What percentage of voting securities constitutes a Change of Control?|What level of ownership counts as a change of control?|How much equity must be acquired for a Change of Control?",
        "coc_notice": "How soon must the {B} notify the {A} of a Change of Control?|Within what period must a Change of Control be notified?|What is the notice deadline after a change of control?"}),
    "warranty": (("Warranty", "Limited Warranty"), (
        'The {A} warrants that the {Thing} will conform in all material respects to the Specifications for a period of {warranty} from the date of Acceptance (the "Warranty Period").',
        'For {warranty} following delivery, the {A} shall repair or replace, at its option, any part of the {Thing} that fails to perform as warranted.',
        '^The {A} warrants that the {Thing} shall be free from defects in materials and workmanship for {warranty} after installation. These warranties are exclusive.'), {
        "warranty": "What is the warranty period?|How long is the warranty?|For how long does the {A} warrant the {Thing}?|How long does the warranty last?|What is the Warranty Period?|warranty period length"}),
    "insurance": (("Insurance",), (
        'The {A} shall maintain, at its own cost, {ins_t1} with limits of not less than {ins1} per occurrence and {ins_t2} of not less than {ins2} in the aggregate.',
        'During the term, the {A} shall carry {ins_t1} in an amount of at least {ins1}, and {ins_t2} with minimum limits of {ins2}, each with insurers of good standing.',
        'The {A} shall obtain and keep in force {ins_t1} of no less than {ins1} per claim and shall name the {B} as an additional insured.'), {
        "ins1": "What is the minimum {ins_t1} coverage?|How much {ins_t1} must the {A} maintain?|What limit of {ins_t1} is required?|What is the required amount of {ins_t1}?",
        "ins2": "What is the minimum {ins_t2} coverage?|How much {ins_t2} must the {A} carry?|What limit of {ins_t2} is required?",
        "absent_ins": "What is the minimum {ins_t3} coverage?|How much {ins_t3} must the {A} maintain?|What limit of {ins_t3} is required?"}),
    "delivery": (("Delivery",), (
        'The {A} shall deliver the {Thing} to {deliv_loc} within {deliv_time} after receipt of a Purchase Order.',
        'Delivery shall be made to {deliv_loc} (the "Delivery Point"). Title and risk of loss pass to the {B} upon delivery.',
        'The {Thing} shall be delivered no later than {deliv_time} after the order date to {deliv_loc}, or such other location as the {B} may designate in writing.'), {
        "deliv_loc": "Where must the {Thing} be delivered?|What is the delivery location?|To what address must the {Thing} be delivered?|What is the Delivery Point?|where is delivery made",
        "deliv_time": "How soon must the {A} deliver after an order?|What is the delivery lead time?|Within how many days must delivery occur?|What is the deadline for delivery after a Purchase Order?"}),
    "notices": (("Notices",), (
        'All notices shall be in writing and sent to the {A} at {notice_addr}, Attention: {att}. Notices sent by registered mail are deemed received {deemed} after posting.',
        'Any notice under this {Agr} shall be deemed given {deemed} after dispatch by courier, or upon transmission if sent by email with confirmation of receipt.',
        'Notices to the {A} must be delivered to {notice_addr}, with a copy to its {att}.'), {
        "notice_addr": "Where must notices to the {A} be sent?|What is the {A}'s notice address?|To what address should notices for the {A} be delivered?",
        "deemed": "When is a notice deemed received?|How long after sending is a notice deemed given?|When are notices sent by courier or mail considered delivered?"}),
    "audit": (("Audit", "Records and Audit"), (
        "The {A} may, upon at least {audit_notice}' prior written notice and no more than {audit_freq}, audit the {B}'s records relating to this {Agr}. If any audit reveals an underpayment exceeding {audit_threshold}, the {B} shall bear the cost of the audit.",
        'The {B} shall keep accurate books for three (3) years and permit inspection {audit_freq}. The {B} shall reimburse audit costs where an underpayment of more than {audit_threshold} is found.',
        "On {audit_notice}' notice, the {A} or its independent accountant may inspect the {B}'s records during normal business hours."), {
        "audit_freq": "How often may the {A} audit the {B}?|How frequently can audits be conducted?|What is the audit frequency limit?",
        "audit_threshold": "What underpayment threshold shifts audit costs to the {B}?|Above what level of underpayment must the {B} pay for the audit?|What discrepancy triggers reimbursement of audit costs?",
        "audit_notice": "How much notice is required before an audit?|What advance notice must be given for an audit?|How much notice must the {A} give before inspecting records?"}),
    "nonsolicit": (("Non-Solicitation",), (
        'During the term and for {nonsolicit} thereafter, neither party shall solicit for employment any employee of the other party who was involved in the performance of this {Agr}.',
        "The {B} agrees not to hire or solicit the {A}'s personnel for a period of {nonsolicit} after termination, except through general advertisements not targeted at such personnel.",
        "For {nonsolicit} following the end of the Term, each party shall refrain from soliciting the other's employees or contractors."), {
        "nonsolicit": "How long does the non-solicitation restriction last?|For how long after termination is solicitation of employees prohibited?|What is the non-solicit period?|How long must the {B} refrain from hiring the {A}'s personnel?"}),
    "force_majeure": (("Force Majeure",), (
        'Neither party shall be liable for delay caused by a Force Majeure Event. If such event continues for more than {fm_period}, either party may terminate this {Agr} upon written notice.',
        'Where performance is prevented by a Force Majeure Event for a continuous period of {fm_period}, the unaffected party may terminate the affected Order without liability.',
        'The affected party shall notify the other within five (5) days of the onset of a Force Majeure Event; if the event persists beyond {fm_period}, either party may terminate.'), {
        "fm_period": "After how long may a party terminate due to a force majeure event?|How long must a force majeure event last before termination is permitted?|What force majeure duration triggers a termination right?|how long can a force majeure event continue before either party may terminate"}),
}
_FILLERS = (  # clauses that carry no question (they still add distracting numbers and defined terms)
    ("Entire Agreement", 'This {Agr}, together with its Schedules, constitutes the entire agreement between the parties and supersedes all prior proposals, negotiations and understandings, whether written or oral.'),
    ("Severability", 'If any provision of this {Agr} is held invalid or unenforceable, the remaining provisions shall continue in full force, and the invalid provision shall be replaced by a valid one that most closely reflects the original intent.'),
    ("Counterparts", 'This {Agr} may be executed in two (2) or more counterparts, each of which shall be deemed an original, and signatures delivered by electronic means shall be binding.'),
    ("Waiver", 'No failure or delay by either party in exercising any right under this {Agr} shall operate as a waiver of that right, and no single exercise shall preclude any further exercise.'),
    ("Survival", 'Sections {n1}, {n2} and {n3}, and any other provision which by its nature is intended to survive, shall survive the termination or expiration of this {Agr}.'),
    ("Relationship of the Parties", 'The parties are independent contractors, and nothing in this {Agr} creates a partnership, joint venture or agency relationship between the {A} and the {B}.'),
    ("Amendment", 'This {Agr} may be amended only by a written instrument signed by authorised representatives of both parties that expressly refers to this {Agr}.'),
)
# Clause kinds a reviewer could confuse; unanswerable questions favour a missing kind next to a present one.
_NEAR = {"term": "renewal warranty", "renewal": "term term_conv", "term_conv": "cure renewal force_majeure",
         "cure": "term_conv insolvency", "insolvency": "cure coc", "payment": "late_interest fees",
         "late_interest": "payment fees", "fees": "payment liability", "liability": "indemnity insurance fees",
         "indemnity": "liability insurance", "confidentiality": "nonsolicit", "law": "venue", "venue": "law",
         "assignment": "coc", "coc": "assignment insolvency", "warranty": "term delivery", "insurance": "liability",
         "delivery": "notices warranty", "notices": "delivery", "audit": "payment late_interest",
         "nonsolicit": "confidentiality", "force_majeure": "term_conv cure", "parties": "notices"}
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
