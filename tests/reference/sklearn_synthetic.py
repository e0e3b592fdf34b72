#!/usr/bin/python3
"""chute against scikit-learn's MultinomialNB on a generated corpus.

    sklearn_synthetic.py path/to/chute

Reference: F. Pedregosa et al., "Scikit-learn: Machine Learning in Python",
JMLR 12, 2825-2830 (2011), version 1.2.1 (Debian python3-sklearn), and its
MultinomialNB documentation (user guide §1.9.2 "Multinomial Naive Bayes";
API page sklearn.naive_bayes.MultinomialNB: alpha, fit_prior,
predict_joint_log_proba, predict_log_proba).

A seeded generator writes documents of space-separated lowercase ASCII
words for four queues that differ in size, document length and word
distribution (each a mixture of a shared Zipf distribution and a queue's
own), plus held-out documents, some with words never learned and one with
no learned word at all. For alpha in {1, 0.3} and prior in {learned,
uniform}, chute learns the documents from a manifest CSV and routes the
held-out ones; scikit-learn fits CountVectorizer(analyzer=str.split) and
MultinomialNB(alpha, fit_prior=(prior == "learned")) on the same
documents. On such text chute's terms are exactly the space-separated
words (lowercase ASCII, no digits, 2 to 10 letters), so both models see the
same counts and must pick the same queue for every document, with every
log posterior within 1e-9 * max(1, |reference|).
"""

import itertools
import math
import os
import random
import sys
import tempfile
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import nb_agreement  # noqa: E402

SEED = 29290
VOCABULARY = 1500       # words the queues draw from
UNSEEN = 200            # words that only held-out documents use
SHARED_SHARE = 0.5      # chance that a word comes from the shared mixture
# queue: (documents learned, documents held out, median length, Zipf s)
QUEUES = {
    "permits": (110, 30, 40, 1.0),
    "claims": (80, 25, 120, 1.1),
    "records": (60, 20, 12, 0.9),
    "billing": (50, 20, 300, 1.2),
}
ALPHAS = ("1", "0.3")
PRIORS = ("learned", "uniform")


def make_words(rng, count, taken):
    words = []
    while len(words) < count:
        w = "".join(rng.choice("abcdefghijklmnopqrstuvwxyz")
                    for _ in range(rng.randint(2, 10)))
        if w not in taken:
            taken.add(w)
            words.append(w)
    return words


def zipf_cumulative(n, s):
    """Cumulative weights of a Zipf distribution, p(rank r) ~ 1/r^s."""
    return list(itertools.accumulate(1.0 / (r + 1) ** s for r in range(n)))


def generate(rng):
    """Returns (learn, held_out): lists of (text, queue)."""
    taken = set()
    vocabulary = make_words(rng, VOCABULARY, taken)
    unseen = make_words(rng, UNSEEN, taken)
    shared = vocabulary[:]
    rng.shuffle(shared)
    shared_weights = zipf_cumulative(len(shared), 1.0)
    own = {}
    for queue, (_, _, _, s) in QUEUES.items():
        order = vocabulary[:]
        rng.shuffle(order)
        own[queue] = (order, zipf_cumulative(len(order), s))

    def document(queue, unseen_share):
        median = QUEUES[queue][2]
        length = max(1, round(rng.lognormvariate(math.log(median), 0.6)))
        words = []
        for _ in range(length):
            if rng.random() < unseen_share:
                words.append(rng.choice(unseen))
            elif rng.random() < SHARED_SHARE:
                words.append(rng.choices(shared, cum_weights=shared_weights)[0])
            else:
                order, weights = own[queue]
                words.append(rng.choices(order, cum_weights=weights)[0])
        return " ".join(words) + "\n"

    seen_texts = set()

    def unique_document(queue, unseen_share):
        # chute learns a given text once, so no text is repeated.
        while True:
            text = document(queue, unseen_share)
            if text not in seen_texts:
                seen_texts.add(text)
                return text

    learn, held_out = [], []
    for queue, (n_learn, n_held, _, _) in QUEUES.items():
        learn += [(unique_document(queue, 0.0), queue) for _ in range(n_learn)]
        held_out += [(unique_document(queue, 0.05), queue)
                     for _ in range(n_held)]
    # Edge cases: only words never learned (the decision rests on the
    # prior), and a single learned word.
    held_out.append((" ".join(unseen[:5]) + "\n", "permits"))
    held_out.append((vocabulary[0] + "\n", "claims"))
    return learn, held_out


def write_corpus(root, learn, held_out):
    """Writes the documents and the manifest; returns (manifest, learn
    file names, held-out file names)."""
    rows, learn_files, held_files = [], [], []
    for i, (text, queue) in enumerate(learn):
        rel = os.path.join("learn", queue, f"doc-{i:04d}.txt")
        os.makedirs(os.path.join(root, "learn", queue), exist_ok=True)
        with open(os.path.join(root, rel), "w", encoding="utf-8") as f:
            f.write(text)
        rows.append((rel, queue))  # relative to the manifest's folder
        learn_files.append(os.path.join(root, rel))
    os.makedirs(os.path.join(root, "held-out"), exist_ok=True)
    for i, (text, _) in enumerate(held_out):
        path = os.path.join(root, "held-out", f"doc-{i:04d}.txt")
        with open(path, "w", encoding="utf-8") as f:
            f.write(text)
        held_files.append(path)
    manifest = os.path.join(root, "learn.csv")
    nb_agreement.write_manifest(manifest, rows)
    return manifest, learn_files, held_files


def main():
    if len(sys.argv) != 2:
        sys.exit("usage: sklearn_synthetic.py path/to/chute")
    binary = os.path.abspath(sys.argv[1])
    started = time.monotonic()
    learn, held_out = generate(random.Random(SEED))
    failed = False
    with tempfile.TemporaryDirectory(prefix="chute-sklearn-") as root:
        manifest, _, held_files = write_corpus(root, learn, held_out)
        train_docs = [text for text, _ in learn]
        train_queues = [queue for _, queue in learn]
        held_docs = [text for text, _ in held_out]
        print(f"corpus: {len(learn)} documents learned, {len(held_out)} held "
              f"out, {len(QUEUES)} queues (seed {SEED})")
        for alpha in ALPHAS:
            for prior in PRIORS:
                db = os.path.join(root, f"alpha-{alpha}-{prior}.db")
                chute = nb_agreement.Chute(binary, db)
                chute.init(alpha, prior)
                chute.learn_csv(manifest)
                decisions = chute.route(held_files, top=len(QUEUES))
                vectorizer, model = nb_agreement.fit_reference(
                    train_docs, train_queues, float(alpha),
                    prior == "learned", str.split)
                agreement = nb_agreement.Agreement()
                agreement.compare(decisions, held_files, held_docs,
                                  vectorizer, model)
                print(f"alpha={alpha} prior={prior}: {agreement.summary()}")
                for message in agreement.failures:
                    print(f"  DISAGREES: {message}")
                failed = failed or bool(agreement.failures)
    print(f"time: {time.monotonic() - started:.1f} s")
    if failed:
        sys.exit("FAILED: chute disagrees with scikit-learn's MultinomialNB "
                 "(details above)")
    print("chute agrees with scikit-learn's MultinomialNB on every document")


if __name__ == "__main__":
    main()
