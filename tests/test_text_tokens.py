"""Tokeniser for BM25: stemming, stopwords, numbers, money, section references."""

from __future__ import annotations

import pytest
from nltk.stem import PorterStemmer

from engine.text_tokens import CONTRACT_KEEP_WORDS, STOPWORDS, document_title, path_search_tokens, tokenize_for_search

_PORTER = PorterStemmer()


def test_porter_examples_from_the_paper():
    # Porter (1980), "An algorithm for suffix stripping", steps 1a-1c worked examples (from memory).
    cases = {
        "caresses": "caress",
        "ponies": "poni",
        "cats": "cat",
        "feed": "feed",
        "plastered": "plaster",
        "motoring": "motor",
        "hopping": "hop",
        "falling": "fall",
        "hissing": "hiss",
        "happy": "happi",
    }
    for word, stem in cases.items():
        assert tokenize_for_search(word) == [stem], word


def test_words_match_reference_stemmer_and_are_lowercased():
    # Reference library: nltk's PorterStemmer (default NLTK_EXTENSIONS mode) on the lowercased word.
    text = "Termination Indemnification CONFIDENTIALITY Assignment Governing Effective Date"
    expected = [_PORTER.stem(w.lower()) for w in text.split()]
    assert tokenize_for_search(text) == expected


def test_stopwords_dropped_but_contract_words_kept():
    # nltk's English stopword list (from memory): "the", "of", "and", "is", "to" are on it.
    assert tokenize_for_search("the of and is to") == []
    # The project's keep list must survive even though most of it is on nltk's list (from memory).
    for word in ["not", "no", "nor", "any", "all", "each", "until", "before", "after", "against", "under"]:
        assert word not in STOPWORDS
        assert tokenize_for_search(word) == [_PORTER.stem(word)], word
    for word in ["within", "without"]:
        assert word in CONTRACT_KEEP_WORDS
        assert tokenize_for_search(word) == [_PORTER.stem(word)]
    # The classic nltk English list has 179 words (from memory).
    assert len(STOPWORDS | CONTRACT_KEEP_WORDS) >= 179


def test_negation_survives_contractions():
    # Own rule (no source): an "n't" contraction yields its base word (if not a stopword) and "not".
    assert tokenize_for_search("Supplier won't assign") == ["supplier", "not", "assign"]
    assert tokenize_for_search("Buyer cannot terminate") == ["buyer", "not", _PORTER.stem("terminate")]
    assert tokenize_for_search("Licensee shan't") == [_PORTER.stem("licensee"), "shall", "not"]
    assert tokenize_for_search("the Seller's obligations") == [_PORTER.stem("seller"), _PORTER.stem("obligations")]
    assert tokenize_for_search("the Seller’s obligations") == tokenize_for_search("the Seller's obligations")


def test_numbers_and_money():
    # Own normalisation rules (no source): commas dropped, zero decimals dropped, sign-prefixed copy kept.
    assert tokenize_for_search("2,450,000") == ["2450000"]
    assert tokenize_for_search("within 90 days") == ["within", "90", "day"]
    assert tokenize_for_search("a fee of $200,000") == ["fee", "200000", "$200000"]
    assert tokenize_for_search("$2,450,000.00") == ["2450000", "$2450000"]
    assert tokenize_for_search("$1,250.50") == ["1250.50", "$1250.50"]
    assert tokenize_for_search("€ 5,000") == ["5000", "€5000"]
    assert tokenize_for_search("5% interest") == ["5", "5%", _PORTER.stem("interest")]
    assert tokenize_for_search("the 30th day") == ["30", "day"]
    assert tokenize_for_search("07") == ["7"]


def test_section_references():
    # Own rule (no source): "14.2(b)(ii)" gives every prefix, so "14.2" matches all its sub-clauses.
    assert tokenize_for_search("Section 9.2.") == ["section", "9.2"]
    assert tokenize_for_search("Section 14.2(b)") == ["section", "14.2", "14.2(b)"]
    assert tokenize_for_search("see 14.2(b)(ii)") == ["see", "14.2", "14.2(b)", "14.2(b)(ii)"]
    assert tokenize_for_search("Clause 9(a)") == ["claus", "9", "9(a)"]
    assert tokenize_for_search("14.2.1") == ["14.2.1"]


def test_pdf_artifacts_are_normalised():
    # Unicode NFKC (Unicode Standard Annex #15) folds the "fi" ligature; a soft hyphen is invisible.
    assert tokenize_for_search("\ufb01nal pay\u00adment") == ["final", "payment"]
    assert tokenize_for_search("x" * 65) == []


def test_deterministic_and_validates_input():
    text = "The Effective Date is 1 March; fees of $10,000 under Section 4.1(c)."
    assert tokenize_for_search(text) == tokenize_for_search(text)
    assert tokenize_for_search("") == []
    with pytest.raises(ValueError):
        tokenize_for_search(None)  # type: ignore[arg-type]


def test_path_tokens_are_the_folder_and_file_words():
    # Our own rule (no outside source): separators and camelCase split words, the extension is dropped, and the
    # words then follow tokenize_for_search (the stems come from nltk's PorterStemmer, checked above).
    assert path_search_tokens("leases/Land_Lease-2024.pdf") == tokenize_for_search("leases Land Lease 2024")
    assert path_search_tokens("PowerPurchaseAgreement.PDF") == tokenize_for_search("Power Purchase Agreement")
    assert path_search_tokens("vendors\\msa+renewal.txt") == tokenize_for_search("vendors msa renewal")
    assert path_search_tokens("NOTES") == ["note"] and path_search_tokens(".env") == ["env"]
    with pytest.raises(ValueError, match="got bytes"):
        path_search_tokens(b"lease.pdf")


def test_document_title_is_a_short_first_line():
    # Our own rule (no outside source): the first non-blank line, if it is 1-12 words, has a letter and does not
    # end like a sentence.
    assert document_title("\n  MUTUAL NONDISCLOSURE AGREEMENT \n\nThis Agreement ...") == "MUTUAL NONDISCLOSURE AGREEMENT"
    assert document_title("Exhibit B - Site Plan\nThe site is shown below.") == "Exhibit B - Site Plan"
    assert document_title("The tenant shall pay rent monthly.\nMore text") == ""  # a sentence
    assert document_title("1. Definitions:\nTerms") == ""
    assert document_title("2024 - 07\nx") == ""  # no letter
    assert document_title(" ".join(["word"] * 13)) == "" and document_title(" ".join(["word"] * 12)) != ""
    assert document_title("") == "" and document_title("\n \n") == ""
    with pytest.raises(ValueError, match="got NoneType"):
        document_title(None)
