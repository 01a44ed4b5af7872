"""The bodies of the five invented demo contracts, in the body markup of ``make_demo_docs.py``.

Scenario (entirely invented): "Brightwater Commons Solar Cooperative" and its counterparties. No real company or person
is named. Answers to tests/data/demo_questions.jsonl are checked against the generated files, so any edit here must
be followed by regenerating demo_docs/ and re-checking that file's pages.
"""

LAND_LEASE_TEXT = """
= SOLAR GROUND LEASE AGREEMENT
This Solar Ground Lease Agreement (this "Lease") is entered into as of March 1, 2024 (the "Effective Date") by and between Wrenfield Orchard Holdings, LLC, a Minnesota limited liability company ("Landlord"), and Brightwater Commons Solar Cooperative, a Minnesota cooperative association ("Tenant"). Landlord and Tenant are each a "Party" and together the "Parties".
# RECITALS
A. Landlord owns approximately 38.5 acres of agricultural land described in Exhibit A (the "Property").
B. Tenant is a member-owned cooperative that intends to develop, construct, own and operate a community solar photovoltaic generating facility on the Property (the "Project") for the benefit of its members.
C. Landlord is willing to lease the Property to Tenant on the terms and subject to the conditions set out in this Lease.
# 1. DEFINITIONS
1.1 "Commercial Operation Date" means the date on which the Project first delivers electric energy to the local distribution grid on a commercial basis, as confirmed by Tenant in a written notice to Landlord.
1.2 "Development Period" means the period beginning on the Effective Date and ending on the earlier of (a) the Commercial Operation Date and (b) the thirty-sixth (36th) month anniversary of the Effective Date.
1.3 "Financing Party" means any person providing debt, equity or tax equity financing for the Project, and any agent or trustee acting for such a person.
1.4 "Operating Term" has the meaning given in Section 3.2, and "Renewal Term" has the meaning given in Section 3.3.
1.5 "Solar Facilities" means all photovoltaic modules, racking, inverters, transformers, cabling, fencing, access roads, monitoring equipment and related improvements installed on the Property by or for Tenant.
# 2. GRANT OF LEASE
2.1 Landlord leases the Property to Tenant, and grants Tenant the exclusive right to use the Property for the purposes of studying, developing, constructing, operating, maintaining, repairing, replacing and removing the Solar Facilities.
2.2 Landlord grants Tenant a non-exclusive easement over Landlord's adjoining land for access, ingress and egress, and for the installation of underground collection lines along the route shown in Exhibit B.
2.3 Landlord reserves the right to use the portion of the Property lying outside the fenced area for the grazing of sheep, provided that such use does not interfere with the Solar Facilities or Tenant's access to them.
# 3. TERM
3.1 Development Period. This Lease commences on the Effective Date and continues through the Development Period. Tenant may terminate this Lease at any time during the Development Period for any reason by giving Landlord not less than ninety (90) days' prior written notice.
3.2 Operating Term. Unless earlier terminated, the operating term of this Lease begins on the Commercial Operation Date and continues for twenty-five (25) years (the "Operating Term").
3.3 Renewal. Tenant may extend the Operating Term for two (2) successive renewal terms of five (5) years each (each, a "Renewal Term") by giving Landlord written notice of extension not less than one hundred eighty (180) days before the end of the then-current term. All terms of this Lease apply during each Renewal Term, except that Operating Rent shall be adjusted as provided in Section 4.3.
3.4 Lapse. If the Commercial Operation Date has not occurred by the end of the Development Period, this Lease terminates automatically unless the Parties agree in writing to extend the Development Period.
# 4. RENT AND PAYMENT
4.1 Development Rent. During the Development Period, Tenant shall pay Landlord development rent of $4,500 per year ("Development Rent"), the first payment being due within thirty (30) days after the Effective Date.
4.2 Operating Rent. Beginning on the Commercial Operation Date, Tenant shall pay Landlord annual operating rent of $1,150 per acre of the Property ("Operating Rent").
4.3 Escalation. On each anniversary of the Commercial Operation Date, Operating Rent increases by two percent (2.0%) over the Operating Rent for the preceding year. On the first day of each Renewal Term, Operating Rent is reset to the greater of (a) the Operating Rent then in effect and (b) the fair market rent determined under Exhibit C.
4.4 Payment Terms. Operating Rent is payable annually in advance on or before January 15 of each calendar year, prorated for any partial year. Payments shall be made by electronic funds transfer to the account designated by Landlord in writing.
4.5 Late Payment. Any amount not paid when due bears interest from the due date until paid at the rate of one and one-half percent (1.5%) per month, or the highest rate permitted by law, whichever is less.
4.6 Crop Damage. Tenant shall compensate Landlord for any growing crops damaged or destroyed by Tenant's activities at the rate of $600 per acre affected.
# 5. TAXES AND UTILITIES
5.1 Landlord shall pay all real property taxes assessed against the Property. Tenant shall reimburse Landlord for any increase in real property taxes attributable solely to the Solar Facilities within sixty (60) days after receiving a copy of the tax bill and reasonable supporting evidence.
5.2 Tenant shall pay for all electricity, water and other utilities it uses on the Property.
# 6. TENANT'S COVENANTS
6.1 Tenant shall comply with all applicable laws, permits and approvals in its use of the Property.
6.2 Tenant shall keep the Property free of mechanics' liens arising from work performed for Tenant, and shall cause any such lien to be discharged or bonded within forty-five (45) days after Tenant receives notice of its filing.
6.3 Tenant shall install and maintain a perimeter security fence around the Solar Facilities and shall maintain vegetative ground cover beneath the modules using pollinator-friendly seed mixes.
6.4 Tenant shall not store hazardous materials on the Property except in quantities customarily used for the construction and operation of solar generating facilities, and shall remediate any release caused by Tenant.
# 7. LANDLORD'S COVENANTS
7.1 Quiet Enjoyment. Landlord covenants that Tenant shall peaceably hold and enjoy the Property during the term of this Lease without interruption by Landlord or any person claiming through Landlord.
7.2 Solar Access. Landlord shall not erect or permit any structure or vegetation taller than twenty (20) feet on Landlord's adjoining land within 250 feet of the fenced area of the Solar Facilities.
7.3 Priority. Landlord shall not grant any mortgage, easement or other interest in the Property that is prior to this Lease without first obtaining a non-disturbance agreement in favor of Tenant and each Financing Party.
# 8. INSURANCE AND INDEMNITY
8.1 Insurance. Tenant shall maintain, at its own cost, commercial general liability insurance with limits of not less than $2,000,000 per occurrence and $5,000,000 in the aggregate, naming Landlord as an additional insured.
8.2 Certificates. Tenant shall deliver certificates of insurance to Landlord before starting construction and within fifteen (15) days after any renewal of its policies.
8.3 Indemnity. Each Party shall indemnify, defend and hold harmless the other Party from third-party claims for bodily injury or property damage to the extent caused by the negligence or wilful misconduct of the indemnifying Party or its contractors.
8.4 Limitation. Neither Party is liable to the other for consequential, incidental, special or punitive damages. Landlord's liability under this Lease is limited to Landlord's interest in the Property.
# 9. DEFAULT AND REMEDIES
9.1 Tenant Default. Each of the following is a "Tenant Default": (a) Tenant fails to pay any rent when due and does not cure the failure within thirty (30) days after receiving written notice from Landlord; or (b) Tenant fails to perform any other obligation under this Lease and does not cure the failure within sixty (60) days after receiving written notice from Landlord, provided that if the failure cannot reasonably be cured within that period, the cure period is extended for so long as Tenant diligently pursues the cure, up to a maximum of one hundred eighty (180) days.
9.2 Landlord Remedies. Upon a Tenant Default that remains uncured, Landlord may (a) terminate this Lease by written notice to Tenant, subject to Section 10.3, or (b) cure the default on Tenant's behalf and recover the reasonable cost of doing so from Tenant.
9.3 Landlord Default. If Landlord fails to perform any obligation under this Lease within thirty (30) days after receiving written notice from Tenant, Tenant may perform the obligation and offset its reasonable cost against the next rent payments.
# 10. ASSIGNMENT AND FINANCING
10.1 Assignment by Tenant. Tenant may not assign this Lease without Landlord's prior written consent, which consent shall not be unreasonably withheld, conditioned or delayed. Despite the preceding sentence, Tenant may assign this Lease without Landlord's consent (a) to any Financing Party as collateral, or (b) to an affiliate of Tenant or to any purchaser of all or substantially all of the Solar Facilities, upon written notice to Landlord.
10.2 Change of Control. A change in the membership or board composition of Tenant is not an assignment of this Lease and does not require Landlord's consent.
10.3 Financing Party Protections. Landlord shall give each Financing Party of which it has been notified a copy of any default notice given to Tenant, and each Financing Party has an additional thirty (30) days after the end of Tenant's cure period under Section 9.1 to cure the default.
10.4 Sale of Property. Landlord may sell or transfer the Property, provided that the transfer is made subject to this Lease and the transferee assumes Landlord's obligations in writing.
# 11. DECOMMISSIONING
11.1 Removal. Within twelve (12) months after the expiration or earlier termination of this Lease, Tenant shall remove the Solar Facilities to a depth of forty-eight (48) inches below grade and restore the Property to substantially its condition on the Effective Date, reasonable wear excepted.
11.2 Security. Before the tenth (10th) anniversary of the Commercial Operation Date, Tenant shall provide Landlord with a bond or letter of credit in the amount of $85,000 (the "Decommissioning Security").
# 12. CONFIDENTIALITY
12.1 Landlord shall keep the terms of this Lease, including the rent, and all information about the Project provided by Tenant confidential, and shall not disclose them except to its lenders, advisers and prospective purchasers of the Property who agree to keep them confidential.
12.2 The obligations in this Section 12 survive for two (2) years after the expiration or termination of this Lease.
# 13. NOTICES
13.1 All notices under this Lease must be in writing and delivered personally, by nationally recognized overnight courier, or by certified mail, return receipt requested, to the addresses set out below the signatures of the Parties. A notice is effective on delivery or on refusal of delivery.
13.2 A copy of each notice to Tenant shall also be sent by email to notices@brightwater-commons.example, but email alone is not effective notice.
# 14. GOVERNING LAW AND DISPUTES
14.1 This Lease is governed by the laws of the State of Minnesota, without regard to its conflict of laws principles.
14.2 Any action arising out of this Lease shall be brought exclusively in the district court for the county in which the Property is located. Each Party waives any right to trial by jury.
# 15. MISCELLANEOUS
15.1 Memorandum. The Parties shall sign a memorandum of this Lease, which Tenant may record within thirty (30) days after the Effective Date.
15.2 Entire Agreement. This Lease, including its Exhibits, is the entire agreement of the Parties about its subject matter and supersedes all prior discussions.
15.3 Amendment. This Lease may be amended only by a written instrument signed by both Parties.
15.4 Severability. If any provision of this Lease is held invalid, the remaining provisions continue in full force.
15.5 Counterparts. This Lease may be signed in counterparts, each of which is an original.
[Signature page follows]
@pagebreak
# SIGNATURES
IN WITNESS WHEREOF, the Parties have signed this Lease as of the Effective Date.
~ LANDLORD: Wrenfield Orchard Holdings, LLC
~ By: ______________________________
~ Title: Managing Member (Signatory A)
~ Address: 400 Orchard Lane, Wrenfield Township
~
~ TENANT: Brightwater Commons Solar Cooperative
~ By: ______________________________
~ Title: Chair of the Board (Signatory B)
~ Address: 12 Commons Road, Brightwater
# EXHIBIT A - DESCRIPTION OF THE PROPERTY
Lot 3 of the Wrenfield Orchard Subdivision, according to the recorded plat, containing approximately 38.5 acres, tax parcel number WR-0381-22.
# EXHIBIT B - ACCESS AND COLLECTION ROUTE
A strip of land thirty (30) feet wide running along the eastern boundary of Lot 4 from the public road to the northeast corner of the Property.
# EXHIBIT C - FAIR MARKET RENT
Fair market rent is the annual rent per acre that a willing landlord and a willing tenant would agree for comparable solar ground leases in the same county, determined by one independent appraiser chosen jointly by the Parties.
"""

SUPPLY_TEXT = """
= EQUIPMENT SUPPLY AGREEMENT
This Equipment Supply Agreement (this "Agreement") is made as of June 10, 2024 (the "Effective Date") between Kestrelmark Photovoltaic Supply Co., a New York corporation ("Supplier"), and Brightwater Commons Solar Cooperative, a Minnesota cooperative association ("Buyer"). Supplier and Buyer are each a "Party".
# 1. DEFINITIONS
1.1 "Business Day" means any day other than a Saturday, a Sunday or a day on which banks in New York, New York are authorized to close.
1.2 "Delivery Point" means the laydown area at the Site designated by Buyer in writing.
1.3 "Equipment" means the photovoltaic modules, string inverters, spare parts and documentation listed in Schedule 1.
1.4 "Final Acceptance" means Buyer's written confirmation under Section 5.3 that the Equipment has passed the acceptance tests.
1.5 "Site" means the community solar project site leased by Buyer under its ground lease dated March 1, 2024.
# 2. SUPPLY AND DELIVERY
2.1 Supply. Supplier shall manufacture or procure, sell and deliver to Buyer the Equipment, consisting of 6,840 bifacial photovoltaic modules of 620 watts each and twenty-two (22) string inverters, together with the spare parts listed in Schedule 1.
2.2 Delivery. Supplier shall deliver all Equipment to the Delivery Point, Delivered Duty Paid, on or before October 31, 2024 (the "Guaranteed Delivery Date"). Supplier shall give Buyer at least five (5) Business Days' notice of each shipment.
2.3 Change Orders. Buyer may change the quantities of Equipment by written change order, priced at the unit prices in Schedule 1. No change order may increase the Contract Price by more than fifteen percent (15%) without Supplier's consent.
# 3. PRICE AND PAYMENT
3.1 Contract Price. The total price for the Equipment is $1,412,600 (the "Contract Price"), inclusive of packaging, freight, transit insurance and all duties, but exclusive of sales and use taxes, which Buyer shall pay or for which it shall provide an exemption certificate.
3.2 Installments. Buyer shall pay the Contract Price in the following installments: (a) ten percent (10%) upon signature of this Agreement; (b) sixty percent (60%) upon delivery of all Equipment to the Delivery Point; and (c) thirty percent (30%) upon Final Acceptance.
3.3 Invoices. Supplier shall invoice each installment when it becomes due. Buyer shall pay each undisputed invoice within forty-five (45) days after receipt.
3.4 Disputed Amounts. Buyer may withhold any amount disputed in good faith by notifying Supplier in writing of its reasons within ten (10) Business Days after receiving the invoice. The Parties shall resolve the dispute under Section 13.
3.5 Late Payment. Overdue undisputed amounts bear interest at one percent (1%) per month from the due date until paid.
# 4. TITLE, RISK AND DELAY
4.1 Title. Title to each item of Equipment passes to Buyer upon the earlier of payment for that item and its delivery to the Delivery Point.
4.2 Risk. Risk of loss of each item of Equipment passes to Buyer upon its delivery at the Delivery Point.
4.3 Delay Damages. If Supplier fails to deliver all Equipment by the Guaranteed Delivery Date, Supplier shall pay Buyer liquidated damages of one-half of one percent (0.5%) of the Contract Price for each full week of delay, up to a maximum of ten percent (10%) of the Contract Price. The Parties agree that these amounts are a genuine pre-estimate of loss and not a penalty.
4.4 Extended Delay. If delivery is delayed by more than ten (10) weeks after the Guaranteed Delivery Date, Buyer may terminate this Agreement under Section 11.2 without giving Supplier an opportunity to cure.
# 5. INSPECTION AND ACCEPTANCE
5.1 Inspection. Buyer may inspect the Equipment within five (5) Business Days after delivery and shall notify Supplier of any visible damage or shortage in that period.
5.2 Acceptance Tests. Buyer shall carry out the acceptance tests described in Schedule 2 within sixty (60) days after delivery, and Supplier may attend.
5.3 Final Acceptance. When the Equipment passes the acceptance tests, Buyer shall confirm Final Acceptance in writing within five (5) Business Days. If the Equipment fails any test, Supplier shall correct the failure and the test shall be repeated.
# 6. WARRANTIES
6.1 Product Warranty. Supplier warrants that the Equipment is new, free from defects in materials and workmanship, and conforms to the specifications in Schedule 1.
6.2 Warranty Periods. The warranty in Section 6.1 applies (a) to photovoltaic modules, for twelve (12) years after Final Acceptance, and (b) to inverters and all other Equipment, for ten (10) years after Final Acceptance (each, a "Warranty Period").
6.3 Performance Warranty. Supplier warrants that the power output of each module shall be not less than 98% of its nameplate rating during the first year and shall decline by no more than 0.45% of nameplate per year thereafter, so that output is not less than 84.95% of nameplate at the end of the thirtieth (30th) year.
6.4 Claims. Buyer shall notify Supplier of any warranty claim within thirty (30) days after discovering the defect. Supplier shall repair or replace defective Equipment within twenty (20) Business Days after the claim, at its own cost, including shipping and reinstallation labor.
6.5 Disclaimer. Except as set out in this Section 6, Supplier makes no other warranty, express or implied, including any implied warranty of merchantability or fitness for a particular purpose.
# 7. INTELLECTUAL PROPERTY INDEMNITY
7.1 Supplier shall defend and indemnify Buyer against any third-party claim that the Equipment, or Buyer's use of it as permitted by this Agreement, infringes any patent, copyright or trade secret.
# 8. LIMITATION OF LIABILITY
8.1 Exclusion. Neither Party is liable to the other for indirect, incidental, consequential or punitive damages, including lost profits, except for breach of Section 10, the indemnity in Section 7 or fraud.
8.2 Cap. Supplier's total aggregate liability arising out of or in connection with this Agreement shall not exceed one hundred percent (100%) of the Contract Price. Buyer's total aggregate liability shall not exceed the unpaid portion of the Contract Price.
# 9. INSURANCE
9.1 Supplier shall maintain product liability insurance with a limit of not less than $5,000,000 per occurrence, and cargo insurance covering the full replacement value of the Equipment while in transit.
9.2 Supplier shall provide certificates of insurance within ten (10) days after Buyer's request.
# 10. CONFIDENTIALITY
10.1 Each Party shall keep confidential all non-public information received from the other Party under this Agreement and use it only to perform this Agreement.
10.2 The obligations in this Section 10 survive for three (3) years after the expiration or termination of this Agreement.
# 11. TERM AND TERMINATION
11.1 Term. This Agreement begins on the Effective Date and continues until the end of the last Warranty Period to expire.
11.2 Termination for Cause. Either Party may terminate this Agreement by written notice if the other Party commits a material breach and fails to cure it within twenty (20) Business Days after receiving written notice describing the breach, except as provided in Section 4.4.
11.3 Termination for Convenience. Buyer may terminate this Agreement for convenience at any time before shipment of the Equipment by giving Supplier twenty-one (21) days' written notice. Buyer shall then pay Supplier's documented, non-cancellable costs incurred up to the date of termination, not exceeding the installments then due under Section 3.2.
11.4 Insolvency. Either Party may terminate this Agreement immediately if the other Party becomes insolvent or makes a general assignment for the benefit of its creditors.
# 12. ASSIGNMENT AND CHANGE OF CONTROL
12.1 Neither Party may assign this Agreement without the prior written consent of the other Party, except that Buyer may assign this Agreement to a lender or other financing party of the Site, or to an affiliate, without consent.
12.2 Any change of control of Supplier, meaning the acquisition by any person of more than fifty percent (50%) of Supplier's voting shares, is an assignment requiring Buyer's consent. Supplier shall notify Buyer within five (5) Business Days after any such change of control.
# 13. GOVERNING LAW AND DISPUTE RESOLUTION
13.1 This Agreement is governed by the laws of the State of New York, excluding the United Nations Convention on Contracts for the International Sale of Goods.
13.2 Escalation. Any dispute shall first be referred to a senior manager of each Party, who shall meet within fifteen (15) days after a written request by either Party.
13.3 Arbitration. Any dispute not resolved within forty-five (45) days after the request under Section 13.2 shall be finally resolved by binding arbitration before a single arbitrator seated in Albany, New York, conducted in English.
# 14. FORCE MAJEURE
14.1 Neither Party is liable for delay caused by events beyond its reasonable control, provided it notifies the other Party within five (5) Business Days. Either Party may terminate this Agreement if a force majeure event continues for more than one hundred twenty (120) consecutive days.
# 15. GENERAL
15.1 Notices must be in writing and delivered by hand, by courier or by email with confirmation of receipt, to the addresses below the signatures.
15.2 This Agreement, including its Schedules, is the entire agreement of the Parties about its subject matter. It may be amended only in writing signed by both Parties.
@pagebreak
# SIGNATURES
~ SUPPLIER: Kestrelmark Photovoltaic Supply Co.
~ By: ______________________________
~ Title: Vice President, Sales (Signatory C)
~
~ BUYER: Brightwater Commons Solar Cooperative
~ By: ______________________________
~ Title: Chair of the Board (Signatory B)
# SCHEDULE 1 - EQUIPMENT AND UNIT PRICES
~ Item 1: Bifacial photovoltaic modules, 620 W; quantity 6,840; unit price $164.00; total $1,121,760.
~ Item 2: String inverters; quantity 22; unit price $11,800.00; total $259,600.
~ Item 3: Spare parts kit and documentation; lump sum $31,240.
~ Contract Price: $1,412,600.
# SCHEDULE 2 - ACCEPTANCE TESTS
Visual inspection of every pallet; flash-test report review for a sample of two percent (2%) of modules; insulation resistance test of each inverter; and a seventy-two (72) hour energized run of all inverters without fault.
"""

PPA_TEXT = """
= POWER PURCHASE AGREEMENT
This Power Purchase Agreement (this "Agreement") is entered into as of September 3, 2024 (the "Effective Date") between Brightwater Commons Solar Cooperative, a Minnesota cooperative association ("Seller"), and Fernhollow Municipal Light Board, a municipal electric utility organized under the laws of the State of Wisconsin ("Buyer"). Seller and Buyer are each a "Party".
# 1. DEFINITIONS
1.1 "Commercial Operation Date" or "COD" means the date on which Seller notifies Buyer that the Facility has been completed, has passed its interconnection tests and is able to deliver energy at the Contract Capacity.
1.2 "Contract Capacity" means 4.2 MWac.
1.3 "Contract Year" means each period of twelve (12) months beginning on the Commercial Operation Date or on an anniversary of it.
1.4 "Delivered Energy" means the electric energy generated by the Facility and delivered to Buyer at the Delivery Point, as measured by the revenue meter under Section 8.1.
1.5 "Delivery Point" means the point of interconnection of the Facility with Buyer's distribution system.
1.6 "Environmental Attributes" means all renewable energy credits, certificates and other attributes arising from the generation of energy by the Facility.
1.7 "Expected Annual Energy" means 6,900 MWh per Contract Year.
1.8 "Facility" means Seller's community solar photovoltaic generating facility with a nameplate capacity of approximately 4.2 MWac, located on land leased by Seller.
1.9 "Prime Rate" means the prime lending rate published by a major national newspaper on the first Business Day of the month in which interest begins to accrue.
# 2. TERM
2.1 Effectiveness. This Agreement is effective and binding on the Effective Date.
2.2 Delivery Term. The delivery term begins on the Commercial Operation Date and continues for twenty (20) Contract Years (the "Delivery Term"), unless this Agreement is terminated earlier under its terms.
2.3 Extension. Buyer may extend the Delivery Term for one (1) additional period of ten (10) years by giving Seller written notice at least twelve (12) months before the end of the Delivery Term, at a Contract Price to be agreed by the Parties.
# 3. COMMERCIAL OPERATION
3.1 Seller shall use commercially reasonable efforts to achieve the Commercial Operation Date on or before December 31, 2025 (the "Guaranteed Commercial Operation Date").
3.2 Delay Damages. If the Commercial Operation Date has not occurred by the Guaranteed Commercial Operation Date, Seller shall pay Buyer delay damages of $250 per MWac of Contract Capacity for each day of delay, for up to one hundred eighty (180) days.
3.3 If the Commercial Operation Date has not occurred within one hundred eighty (180) days after the Guaranteed Commercial Operation Date, Buyer may terminate this Agreement by giving Seller thirty (30) days' written notice, and Buyer may draw on the Development Security.
# 4. PURCHASE AND SALE
4.1 Seller shall sell and deliver, and Buyer shall purchase and receive, all Delivered Energy and all associated Environmental Attributes.
4.2 Contract Price. Buyer shall pay $68.50 per MWh of Delivered Energy in the first Contract Year. The Contract Price increases by one and one-half percent (1.5%) on the first day of each later Contract Year.
4.3 Curtailment. If Buyer curtails the Facility for reasons other than a system emergency for more than fifty (50) hours in any Contract Year, Buyer shall pay the Contract Price for the energy the Facility would have delivered during the excess hours.
4.4 Environmental Attributes. Title to the Environmental Attributes passes to Buyer at the same time as title to the Delivered Energy. Seller shall transfer them through the applicable tracking system each month.
# 5. BILLING AND PAYMENT
5.1 On or before the tenth (10th) day of each month, Seller shall deliver to Buyer an invoice for the Delivered Energy of the preceding month, with meter data supporting it.
5.2 Buyer shall pay each invoice within thirty (30) days after receiving it, by electronic funds transfer.
5.3 Late Payment. Any amount not paid when due bears interest at the Prime Rate plus two percent (2%) per annum from the due date until paid.
5.4 Disputes and Audit. A Party disputing an invoice shall pay the undisputed portion when due and give notice of the dispute within twelve (12) months after the invoice date. Each Party may audit the other Party's records relating to this Agreement for two (2) years after the relevant invoice.
# 6. PERFORMANCE GUARANTEE
6.1 Seller guarantees that the Delivered Energy in each period of two (2) consecutive Contract Years will be not less than eighty-five percent (85%) of the Expected Annual Energy for that period.
6.2 For any shortfall, Seller shall pay Buyer the amount by which Buyer's reasonable cost of replacement energy exceeds the Contract Price, not to exceed $35 per MWh of shortfall.
# 7. CREDIT SUPPORT
7.1 Within thirty (30) days after the Effective Date, Seller shall deliver to Buyer a letter of credit in the amount of $250,000 (the "Development Security").
7.2 On the Commercial Operation Date, Seller shall replace the Development Security with a letter of credit in the amount of $420,000 (the "Operating Security"), to be maintained throughout the Delivery Term.
# 8. METERING AND OPERATION
8.1 Seller shall install and maintain a revenue-quality meter at the Delivery Point, which shall be tested at least once in each Contract Year. If a test shows an error of more than two percent (2%), the Parties shall adjust past invoices for the period of the error.
8.2 Seller shall operate and maintain the Facility in accordance with prudent utility practice and shall give Buyer at least thirty (30) days' notice of each planned maintenance outage.
# 9. EVENTS OF DEFAULT
9.1 Each of the following is an "Event of Default" of the Party concerned: (a) failure to pay any amount when due which is not cured within ten (10) Business Days after written notice; (b) failure to perform any other material obligation which is not cured within forty-five (45) days after written notice, extended to ninety (90) days if the Party is diligently pursuing the cure; (c) bankruptcy or insolvency; or (d) Seller's failure to maintain the credit support required by Section 7 which is not cured within five (5) Business Days.
9.2 Remedies. While an Event of Default is continuing, the non-defaulting Party may terminate this Agreement by written notice and recover the Termination Payment under Section 9.3.
9.3 Termination Payment. The Termination Payment is the present value of the non-defaulting Party's losses and costs from the termination, net of its gains, for the remainder of the Delivery Term, discounted at the Prime Rate.
# 10. FORCE MAJEURE
10.1 A Party is excused from performance to the extent prevented by force majeure, provided it gives prompt notice and uses reasonable efforts to resume performance. If force majeure prevents a Party from performing for more than three hundred sixty-five (365) consecutive days, either Party may terminate this Agreement on sixty (60) days' written notice without liability.
# 11. LIMITATION OF LIABILITY
11.1 Neither Party is liable for consequential, incidental, special or punitive damages, except for the delay damages and shortfall payments expressly provided in this Agreement.
11.2 Each Party's total aggregate liability under this Agreement in any Contract Year shall not exceed $750,000, excluding payment for Delivered Energy and liability for fraud, gross negligence or wilful misconduct.
# 12. INSURANCE
12.1 Seller shall maintain commercial general liability insurance of not less than $2,000,000 per occurrence, umbrella liability insurance of not less than $5,000,000, and property insurance on the Facility for its full replacement cost.
# 13. ASSIGNMENT AND CHANGE OF CONTROL
13.1 Neither Party may assign this Agreement without the other Party's prior written consent, which shall not be unreasonably withheld. Seller may collaterally assign this Agreement to a lender without Buyer's consent.
13.2 Seller shall notify Buyer in writing within ten (10) days after any change of control of Seller. A change of control of Seller does not require Buyer's consent, provided that the Facility continues to be operated by an operator with at least three (3) years of experience operating solar generating facilities.
# 14. CONFIDENTIALITY
14.1 Each Party shall keep the terms of this Agreement confidential, except as required by law, including the public records laws that apply to Buyer.
14.2 The obligations in this Section 14 survive for one (1) year after the expiration or termination of this Agreement.
# 15. GOVERNING LAW AND DISPUTES
15.1 This Agreement is governed by the laws of the State of Wisconsin.
15.2 The Parties shall try to resolve any dispute by negotiation between senior officers for thirty (30) days. After that period, either Party may bring proceedings in the state courts located in the county of Buyer's principal office.
# 16. GENERAL
16.1 Notices must be in writing and are effective on receipt when delivered by hand, by courier or by certified mail to the addresses below the signatures.
16.2 This Agreement is the entire agreement of the Parties about its subject matter and may be amended only in writing signed by both Parties.
@pagebreak
# SIGNATURES
~ SELLER: Brightwater Commons Solar Cooperative
~ By: ______________________________
~ Title: Chair of the Board (Signatory B)
~
~ BUYER: Fernhollow Municipal Light Board
~ By: ______________________________
~ Title: General Manager (Signatory D)
"""

OM_TEXT = """
= OPERATIONS AND MAINTENANCE SERVICES AGREEMENT
This Operations and Maintenance Services Agreement (this "Agreement") is dated January 6, 2025 (the "Effective Date") and is between Brightwater Commons Solar Cooperative, a Minnesota cooperative association ("Owner"), and Cindervale Field Services, Inc., an Iowa corporation ("Contractor").
# 1. DEFINITIONS
1.1 "Availability" means, for a Contract Year, the percentage of daylight hours in which the Facility's inverters were able to export energy, excluding hours lost to grid outages and force majeure.
1.2 "Commencement Date" means the date on which Owner notifies Contractor that the Facility has achieved commercial operation.
1.3 "Contract Year" means each twelve (12) month period beginning on the Commencement Date or an anniversary of it.
1.4 "Facility" means Owner's community solar photovoltaic generating facility of approximately 4.2 MWac.
1.5 "Services" means the preventive maintenance, corrective maintenance and monitoring services described in Section 2.
# 2. SERVICES
2.1 Preventive Maintenance. Contractor shall carry out quarterly site inspections, semi-annual vegetation management, an annual thermographic survey of all modules, and module cleaning twice in each Contract Year.
2.2 Corrective Maintenance. Contractor shall diagnose and repair faults in the Facility in accordance with the service levels in Section 5.
2.3 Monitoring. Contractor shall monitor the Facility remotely twenty-four (24) hours a day and deliver a monthly performance report by the fifteenth (15th) day of each month.
# 3. TERM
3.1 Initial Term. This Agreement takes effect on the Effective Date, and the Services begin on the Commencement Date. The initial term ends five (5) years after the Commencement Date (the "Initial Term").
3.2 Renewal. This Agreement renews automatically for successive one (1) year periods unless either Party gives the other written notice of non-renewal at least one hundred twenty (120) days before the end of the then-current term.
# 4. FEES AND PAYMENT
4.1 Owner shall pay Contractor the fees set out in the following fee schedule.
| Item | Charge | Basis |
| Fixed Annual Fee (preventive maintenance and monitoring) | $46,200 | per Contract Year, invoiced monthly in arrears |
| Corrective maintenance labor | $118 per technician hour | time and materials |
| Emergency call-out outside normal hours | $650 per call-out | plus hourly labor |
| Additional module cleaning | $0.85 per module | per cleaning requested by Owner |
| Spare parts supplied by Contractor | cost plus 8% | handling markup |
4.2 The Fixed Annual Fee is invoiced monthly in arrears in twelve (12) equal instalments. Owner shall pay each undisputed invoice within thirty (30) days after the invoice date.
4.3 Escalation. All fees increase by two and one-half percent (2.5%) on each anniversary of the Commencement Date.
4.4 Late Payment. Overdue amounts bear interest at three-quarters of one percent (0.75%) per month.
# 5. SERVICE LEVELS AND AVAILABILITY
5.1 Contractor shall respond to and attend faults within the times in the following table, measured from the time the fault is detected by monitoring or reported by Owner.
| Priority | Description | Response time | On-site time |
| Priority 1 | Loss of more than 25% of Facility output, or any safety hazard | 2 hours | 24 hours |
| Priority 2 | Loss of 5% to 25% of Facility output | 8 hours | 3 Business Days |
| Priority 3 | Loss of less than 5% of Facility output | 2 Business Days | next scheduled visit |
5.2 Availability Guarantee. Contractor guarantees Availability of at least 98.5% in each Contract Year. For each full 0.1% by which Availability falls short, Contractor shall pay Owner liquidated damages of $1,000, capped at twenty percent (20%) of the Fixed Annual Fee for that Contract Year.
# 6. WARRANTY
6.1 Contractor warrants that the Services will be performed in a good and workmanlike manner. If any Services prove defective within twelve (12) months after their completion, Contractor shall re-perform them at its own cost.
# 7. INSURANCE
7.1 Contractor shall maintain commercial general liability insurance of not less than $1,000,000 per occurrence and $2,000,000 in the aggregate, automobile liability insurance of not less than $1,000,000 combined single limit, workers' compensation insurance as required by law, and umbrella liability insurance of not less than $4,000,000.
7.2 Contractor shall name Owner as an additional insured and shall give Owner certificates of insurance before the Commencement Date.
# 8. LIMITATION OF LIABILITY
8.1 Neither Party is liable for indirect or consequential damages, including lost revenue, except for liquidated damages under Section 5.2.
8.2 Contractor's total aggregate liability arising out of this Agreement in any Contract Year shall not exceed the Fixed Annual Fee paid or payable for that Contract Year.
# 9. TERMINATION
9.1 Convenience. Owner may terminate this Agreement for convenience on sixty (60) days' written notice to Contractor.
9.2 Cause. Either Party may terminate this Agreement if the other Party commits a material breach that is not cured within twenty (20) days after written notice.
9.3 Availability. Owner may terminate this Agreement by written notice if Availability falls below the guarantee in Section 5.2 in two (2) consecutive Contract Years.
9.4 Transition. After any termination, Contractor shall cooperate with Owner and any replacement contractor for thirty (30) days to transfer records, passwords and spare parts.
# 10. ASSIGNMENT AND SUBCONTRACTING
10.1 Contractor may not assign this Agreement, or subcontract more than thirty percent (30%) of the Services by value, without Owner's prior written consent, which Owner may withhold in its sole discretion.
10.2 Owner may assign this Agreement without consent to a lender or to any successor owner of the Facility.
10.3 Change of Control. If Contractor undergoes a change of control, Owner may terminate this Agreement on thirty (30) days' notice given within ninety (90) days after Owner learns of the change of control.
# 11. CONFIDENTIALITY
11.1 Contractor shall keep confidential all performance data, site security information and commercial terms received under this Agreement. This obligation survives for four (4) years after the expiration or termination of this Agreement.
# 12. GOVERNING LAW
12.1 This Agreement is governed by the laws of the State of Iowa. The state and federal courts located in the State of Iowa have exclusive jurisdiction over any dispute arising out of it.
# SIGNATURES
~ OWNER: Brightwater Commons Solar Cooperative - By: Chair of the Board (Signatory B)
~ CONTRACTOR: Cindervale Field Services, Inc. - By: President (Signatory E)
"""

NDA_TEXT = """
= MUTUAL NONDISCLOSURE AGREEMENT
This Mutual Nondisclosure Agreement (this "Agreement") is effective as of February 14, 2025 (the "Effective Date") between Brightwater Commons Solar Cooperative, a Minnesota cooperative association, and Larchpoint Storage Systems Ltd., a Delaware corporation (each a "Party"). A Party disclosing information is the "Discloser" and a Party receiving it is the "Recipient".
# 1. PURPOSE
1.1 The Parties wish to exchange information to evaluate a possible battery energy storage system to be co-located with the cooperative's community solar facility (the "Purpose").
# 2. CONFIDENTIAL INFORMATION
2.1 "Confidential Information" means all non-public business, technical and financial information disclosed by the Discloser to the Recipient in connection with the Purpose, whether in writing, orally or by inspection, that is marked confidential or, if disclosed orally, is confirmed as confidential in writing within ten (10) days after disclosure.
2.2 Confidential Information does not include information that (a) is or becomes public through no fault of the Recipient, (b) was known to the Recipient before disclosure, (c) is received from a third party without a duty of confidentiality, or (d) is developed independently by the Recipient.
# 3. OBLIGATIONS
3.1 The Recipient shall use Confidential Information only for the Purpose and shall protect it with at least the degree of care it uses for its own similar information, and no less than reasonable care.
3.2 The Recipient may disclose Confidential Information only to its directors, employees, members and advisers who need to know it for the Purpose and who are bound by confidentiality obligations at least as protective as this Agreement.
3.3 If the Recipient is required by law to disclose Confidential Information, it shall give the Discloser prompt written notice, where lawful, so that the Discloser may seek a protective order.
# 4. RETURN OF INFORMATION
4.1 Within fifteen (15) days after the Discloser's written request, the Recipient shall return or destroy all Confidential Information and confirm in writing that it has done so.
# 5. TERM AND SURVIVAL
5.1 This Agreement has a term of two (2) years from the Effective Date. Either Party may terminate it earlier on thirty (30) days' written notice.
5.2 The Recipient's obligations under Sections 3 and 4 survive for three (3) years after expiration or termination of this Agreement, and for trade secrets for as long as they remain trade secrets.
# 6. NON-SOLICITATION
6.1 For twelve (12) months after the Effective Date, neither Party shall solicit for employment any employee of the other Party with whom it had contact in connection with the Purpose, except through general advertisements.
# 7. NO LICENSE OR OBLIGATION
7.1 No license is granted under this Agreement. All Confidential Information is provided "as is". Neither Party is obliged to enter into any further agreement.
# 8. REMEDIES
8.1 Each Party agrees that a breach of this Agreement may cause irreparable harm, and that the Discloser may seek injunctive relief without posting a bond, in addition to any other remedy.
# 9. GENERAL
9.1 This Agreement is governed by the laws of the State of Delaware, and the state and federal courts located in the State of Delaware have exclusive jurisdiction.
9.2 Neither Party may assign this Agreement without the other Party's prior written consent, except to a successor in a merger or sale of all or substantially all of its assets.
9.3 This Agreement is the entire agreement of the Parties about its subject matter.
# SIGNATURES
~ BRIGHTWATER COMMONS SOLAR COOPERATIVE - By: Chair of the Board (Signatory B)
~ LARCHPOINT STORAGE SYSTEMS LTD. - By: Chief Executive Officer (Signatory F)
"""
