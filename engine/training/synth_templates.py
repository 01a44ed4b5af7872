"""Clause templates for the synthetic contract generator (``synth_contracts``): invented drafting, no real text.

Each kind maps to (headings, templates, {slot: "question|question|..."}); see ``synth_contracts`` for rendering.
"""

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
