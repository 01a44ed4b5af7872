"""Which gold span labels a training window, and the swapped-entity unanswerable questions.

The consensus rule uses the official SQuAD v1.1 token F1 (Rajpurkar et al., 2016); the expected indices below are
worked by hand from that formula. The swap rule follows SQuAD 2.0's "entity swap" category (Rajpurkar et al.,
2018, table 2); its checks are invariants, and the last test runs it over a real training file.
"""

import random

import pytest

from engine.squad_data import GoldAnswer, SquadExample, load_examples
from engine.training.label_choice import consensus_index, with_consensus_first
from engine.training.swap_negatives import swappable_phrases, swapped_entity_negatives
from tests.shared_data import shared_file


def test_consensus_is_the_medoid_by_token_f1():
    # Worked by hand: F1("three", "three brotherhoods") = 2 * (1/1 * 1/2) / (1 + 1/2) = 2/3.
    # Sums over the other answers: "three brotherhoods": 0 + 2/3 + 2/3 = 4/3; each "three": 0 + 2/3 + 1 = 5/3;
    # the long listing shares no token with the others (articles and punctuation are dropped): 0.
    answers = ["See of Cilicia and the brotherhood of St. James", "three brotherhoods", "three", "three"]
    assert consensus_index(answers) == 2  # the first of the tied "three"s
    # Two answers or one: nothing to vote on, the first is kept.
    assert consensus_index(["a long clause here", "short"]) == 0
    assert consensus_index(["only"]) == 0


def test_with_consensus_first_moves_the_medoid_and_keeps_every_answer():
    context = "Each brotherhood elects two delegates who take part in the Assembly."
    texts = ["Each brotherhood elects two delegates who take part in the Assembly", "two delegates", "two delegates"]
    answers = tuple(GoldAnswer(t, context.index(t)) for t in texts)
    ex = SquadExample("q", "t", "How many delegates?", context, answers, False)
    moved = with_consensus_first(ex)
    assert moved.answers[0].text == "two delegates"
    assert sorted(a.text for a in moved.answers) == sorted(texts)
    assert context[moved.answers[0].start:].startswith("two delegates")
    single = SquadExample("s", "t", "How many delegates?", context, answers[:1], False)
    assert with_consensus_first(single) is single


def test_swappable_phrases_skip_the_first_word():
    question = "When did Mount Victoria become a station in 1868?"
    found = swappable_phrases(question)
    assert ("name", "Mount Victoria", question.index("Mount")) in found
    assert ("number", "1868", question.index("1868")) in found
    assert all(p != "When" for _, p, _ in found)


def test_swapped_questions_name_something_the_context_lacks():
    p1 = "The Harbour Bridge opened in 1932 after eight years of work by Bradfield."
    p2 = "The Tower Bridge opened in 1894 and was designed by Jones."
    items = [
        SquadExample("q1", "Bridges", "When did the Harbour Bridge open?", p1, (GoldAnswer("1932", p1.index("1932")),),
                     False),
        SquadExample("q2", "Bridges", "Who designed the Tower Bridge?", p2, (GoldAnswer("Jones", p2.index("Jones")),),
                     False),
    ]
    out = {n.qid: n for n in swapped_entity_negatives(items, random.Random(0), rate=1.0)}
    assert out["q1#s"].question == "When did the Tower Bridge open?"
    assert out["q2#s"].question == "Who designed the Harbour Bridge?"
    assert all(n.is_impossible and n.answers == () for n in out.values())
    assert swapped_entity_negatives(items, random.Random(0), rate=0.0) == []
    with pytest.raises(ValueError, match=r"got -0.1"):
        swapped_entity_negatives(items, random.Random(0), rate=-0.1)


def negatives_with_sources(make_negatives, suffix: str):
    """(negative, the question it came from) pairs, made at rate 0.5 from the first 1,500 TyDi-en train questions."""
    items = load_examples(shared_file("train/tydiqa_goldp_en_train.json.gz"), limit=1500)
    by_id = {e.qid: e for e in items}
    return [(neg, by_id[neg.qid.removesuffix(suffix)]) for neg in make_negatives(items, random.Random(3), rate=0.5)]


def test_swaps_on_a_real_training_file_keep_their_invariants():
    pairs = negatives_with_sources(swapped_entity_negatives, "#s")
    assert len(pairs) > 100
    for neg, source in pairs:
        assert neg.context == source.context and neg.question != source.question
        # Exactly one phrase was replaced, in place: the text before and after it is unchanged.
        head = next(i for i, (a, b) in enumerate(zip(source.question, neg.question)) if a != b)
        tail = len(source.question) - next(i for i, (a, b) in enumerate(zip(source.question[::-1], neg.question[::-1]))
                                           if a != b)
        phrases = {p: at for _, p, at in swappable_phrases(source.question)}
        old = next(p for p, at in phrases.items() if at <= head and at + len(p) >= tail)
        assert old in source.context
        added = [p for _, p, _ in swappable_phrases(neg.question) if p not in source.question]
        assert all(p.casefold() not in neg.context.casefold() for p in added)


def test_average_readers_is_the_weighted_mean_of_each_tensor(tmp_path):
    """theta = (1 - alpha) * theta_a + alpha * theta_b (Wortsman et al., 2022); values worked by hand."""
    import torch
    from safetensors.torch import load_file, save_file

    from engine.training.average import average_readers

    a, b = tmp_path / "a", tmp_path / "b"
    for folder, w, bias in ((a, [[1.0, 2.0], [3.0, 4.0]], [0.0, 1.0]), (b, [[3.0, 2.0], [1.0, 0.0]], [4.0, 5.0])):
        folder.mkdir()
        save_file({"w": torch.tensor(w, dtype=torch.float16), "b": torch.tensor(bias)}, str(folder / "model.safetensors"))
        (folder / "config.json").write_text("{}", encoding="utf-8")
    out = average_readers(a, b, tmp_path / "soup", alpha=0.25)
    merged = load_file(str(out / "model.safetensors"))
    # 0.75 * [[1, 2], [3, 4]] + 0.25 * [[3, 2], [1, 0]] = [[1.5, 2], [2.5, 3]]; 0.75 * [0, 1] + 0.25 * [4, 5] = [1, 2].
    assert merged["w"].dtype == torch.float32 and merged["w"].tolist() == [[1.5, 2.0], [2.5, 3.0]]
    assert merged["b"].tolist() == [1.0, 2.0]
    assert (out / "config.json").exists()
    with pytest.raises(ValueError, match=r"got 1.5"):
        average_readers(a, b, tmp_path / "bad", alpha=1.5)
    save_file({"w": torch.zeros(3)}, str(b / "model.safetensors"))
    with pytest.raises(ValueError, match="differ"):
        average_readers(a, b, tmp_path / "bad")


def test_uniform_soup_is_the_mean_of_k_readers(tmp_path):
    """theta = (theta_1 + ... + theta_k) / k (Wortsman et al., 2022, uniform soup); values worked by hand."""
    import torch
    from safetensors.torch import load_file, save_file

    from engine.training.average import uniform_soup

    folders = []
    for name, w in (("a", [1.0, 2.0]), ("b", [4.0, 2.0]), ("c", [1.0, 5.0])):
        folder = tmp_path / name
        folder.mkdir()
        save_file({"w": torch.tensor(w, dtype=torch.float16)}, str(folder / "model.safetensors"))
        (folder / "config.json").write_text("{}", encoding="utf-8")
        folders.append(folder)
    out = uniform_soup(folders, tmp_path / "soup")
    # ([1, 2] + [4, 2] + [1, 5]) / 3 = [2, 3]
    assert load_file(str(out / "model.safetensors"))["w"].tolist() == [2.0, 3.0]
    assert (out / "config.json").exists()
    with pytest.raises(ValueError, match=r"got 1"):
        uniform_soup(folders[:1], tmp_path / "bad")
    save_file({"w": torch.zeros(3)}, str(folders[2] / "model.safetensors"))
    with pytest.raises(ValueError, match="differ"):
        uniform_soup(folders, tmp_path / "bad")


def test_removing_the_answer_sentence_leaves_an_unanswerable_paragraph():
    # Hand-made paragraph (invented): the answer sits in the second of four sentences.
    from engine.training.removal_negatives import removed_sentence_negatives, without_answer_sentences

    context = ("The Harbour Bridge crosses the Lantern River. It was designed by Jones in 1901. "
               "Trams ran across it until 1958. Today it carries cyclists.")
    ex = SquadExample("q", "Bridges", "Who designed the Harbour Bridge?", context,
                      (GoldAnswer("Jones", context.index("Jones")),), False)
    assert without_answer_sentences(ex) == ("The Harbour Bridge crosses the Lantern River. "
                                            "Trams ran across it until 1958. Today it carries cyclists.")
    (neg,) = removed_sentence_negatives([ex], random.Random(0), rate=1.0)
    assert neg.qid == "q#r" and neg.is_impossible and neg.answers == () and neg.question == ex.question
    # The answer text also in a kept sentence: no fair negative. Too little left: none either.
    repeated = SquadExample("r", "Bridges", ex.question, context + " Jones also built the quay.",
                            ex.answers, False)
    assert without_answer_sentences(repeated) is None
    short = "It was designed by Jones in 1901. Today it carries cyclists."
    assert without_answer_sentences(SquadExample("s", "B", ex.question, short,
                                                 (GoldAnswer("Jones", short.index("Jones")),), False)) is None
    assert removed_sentence_negatives([ex], random.Random(0), rate=0.0) == []
    with pytest.raises(ValueError, match=r"got 1.5"):
        removed_sentence_negatives([ex], random.Random(0), rate=1.5)


def test_answer_sentence_removal_on_a_real_training_file_keeps_its_invariants():
    from engine.sentences import split_sentences
    from engine.training.removal_negatives import MIN_KEPT_SENTENCES, removed_sentence_negatives

    pairs = negatives_with_sources(removed_sentence_negatives, "#r")
    assert len(pairs) > 50
    for neg, source in pairs:
        assert len(neg.context) < len(source.context) and neg.is_impossible
        assert not any(a.text.casefold() in neg.context.casefold() for a in source.answers)
        kept = [source.context[s:e] for s, e in split_sentences(source.context) if source.context[s:e] in neg.context]
        assert len(kept) >= MIN_KEPT_SENTENCES
