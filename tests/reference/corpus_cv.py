#!/usr/bin/python3
"""5-fold cross-validation of chute on an outside corpus, against
scikit-learn.

    corpus_cv.py reuters|manpages path/to/chute BUILD_DIR

Corpora (see corpora.py for the sources and how they are read):
  reuters   Reuters-21578 'acq' and 'crude' (David D. Lewis, "Reuters-21578
            text categorization test collection", Distribution 1.0, 1997),
            from Debian r-cran-tm; TITLE and BODY read with libxml2 (lxml).
  manpages  the Linux man-pages project, sections 2, 3, 4, 5 and 7 (Debian
            manpages, manpages-dev 6.03), rendered to text with groff;
            renderings are cached in BUILD_DIR/reference-cache.
Folds: fixed in tests/reference/folds/<corpus>.csv (make_folds.py).

For each fold, chute learns the other four folds (a manifest CSV) with
alpha 1 and the learned prior, and routes the held-out fold with
--format jsonl --top <all queues>. Two references, scikit-learn 1.2.1
(F. Pedregosa et al., "Scikit-learn: Machine Learning in Python", JMLR 12,
2011; MultinomialNB documentation, user guide §1.9.2):

  1. Asserted: MultinomialNB(alpha=1, fit_prior=True) over CountVectorizer
     whose analyzer returns chute's own terms of each document (`chute
     terms-of --format jsonl`) must route every held-out document to the
     same queue, with every log posterior within 1e-9 * max(1, |ref|).
  2. Reported, not asserted: scikit-learn's defaults, CountVectorizer() on
     the raw text + MultinomialNB(), as a yardstick for chute's accuracy
     and macro-F1 (the unweighted mean over queues of each queue's F1,
     computed by sklearn.metrics). Each figure pools the predictions of
     the five held-out folds, so every document is predicted once.

  3. Asserted: one store learns every document, and `chute evaluate
     --folds-csv` on the same folds (each fold's model made by subtracting
     its stored counts) must route every document as its fold's store did,
     with the same posteriors, and report the same accuracy and macro-F1
     (evaluate_agreement.py).

Prints the figures and writes them to BUILD_DIR/reference-results/
<corpus>.json. Exits non-zero, naming every disagreement, on failure.
"""

import csv
import json
import os
import sys
import tempfile
import time

from sklearn.feature_extraction.text import CountVectorizer
from sklearn.metrics import accuracy_score, f1_score
from sklearn.naive_bayes import MultinomialNB

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import corpora  # noqa: E402
import evaluate_agreement  # noqa: E402
import nb_agreement  # noqa: E402

HERE = os.path.dirname(os.path.abspath(__file__))
FOLDS = 5
ALPHA = "1"
PRIOR = "learned"


def read_folds(corpus):
    path = os.path.join(HERE, "folds", f"{corpus}.csv")
    with open(path, newline="", encoding="utf-8") as f:
        rows = [(r["path"], r["queue"], int(r["fold"]))
                for r in csv.DictReader(f)]
    folds = {fold for _, _, fold in rows}
    if folds != set(range(1, FOLDS + 1)):
        raise corpora.CorpusError(f"{path}: folds {sorted(folds)}, expected "
                                  f"1..{FOLDS}")
    return rows


def materialize(corpus, rows, build_dir, scratch):
    """Writes each document's text to a file; returns {path: text file}."""
    if corpus == "manpages":
        started = time.monotonic()
        files, rendered = corpora.render_manpages(
            [p for p, _, _ in rows], os.path.join(build_dir, "reference-cache"))
        print(f"render: {rendered} of {len(rows)} pages rendered with groff "
              f"(others cached) in {time.monotonic() - started:.1f} s")
        return files
    files = {}
    for rel, _, _ in rows:
        target = os.path.join(scratch, "text", rel[:-len(".xml")] + ".txt")
        os.makedirs(os.path.dirname(target), exist_ok=True)
        with open(target, "w", encoding="utf-8") as f:
            f.write(corpora.reuters_text(rel))
        files[rel] = target
    return files


def main():
    if len(sys.argv) != 4 or sys.argv[1] not in ("reuters", "manpages"):
        sys.exit("usage: corpus_cv.py reuters|manpages path/to/chute BUILD_DIR")
    corpus, binary, build_dir = sys.argv[1], os.path.abspath(sys.argv[2]), \
        os.path.abspath(sys.argv[3])
    started = time.monotonic()
    try:
        rows = read_folds(corpus)
    except (OSError, corpora.CorpusError) as e:
        sys.exit(f"FAILED: {e}")
    queues = sorted({q for _, q, _ in rows})

    with tempfile.TemporaryDirectory(prefix=f"chute-{corpus}-") as scratch:
        try:
            files = materialize(corpus, rows, build_dir, scratch)
        except corpora.CorpusError as e:
            sys.exit(f"FAILED: {e}")
        texts = {}
        for rel, _, _ in rows:
            with open(files[rel], encoding="utf-8") as f:
                texts[files[rel]] = f.read()

        # chute's terms of every document, under the settings of the stores
        # below (chute's defaults).
        terms_chute = nb_agreement.Chute(binary, os.path.join(scratch, "t.db"))
        terms_chute.init(ALPHA, PRIOR)
        t0 = time.monotonic()
        terms = terms_chute.terms_of([files[rel] for rel, _, _ in rows])
        missing = [files[r] for r, _, _ in rows if files[r] not in terms]
        if missing:
            sys.exit(f"FAILED: chute terms-of gave no terms for {missing[:5]}")
        print(f"terms-of: {len(terms)} documents in "
              f"{time.monotonic() - t0:.1f} s")

        agreement = nb_agreement.Agreement()
        truth, chute_pred, default_pred = [], [], []
        all_decisions = {}
        chute_seconds = 0.0
        for fold in range(1, FOLDS + 1):
            learn = [(files[r], q) for r, q, k in rows if k != fold]
            held = [(files[r], q) for r, q, k in rows if k == fold]
            chute = nb_agreement.Chute(
                binary, os.path.join(scratch, f"fold-{fold}.db"))
            manifest = os.path.join(scratch, f"fold-{fold}-learn.csv")
            nb_agreement.write_manifest(manifest, learn)
            t0 = time.monotonic()
            chute.init(ALPHA, PRIOR)
            chute.learn_csv(manifest)
            decisions = chute.route([f for f, _ in held], top=len(queues))
            chute_seconds += time.monotonic() - t0
            all_decisions.update(decisions)

            held_files = [f for f, _ in held]
            vectorizer, model = nb_agreement.fit_reference(
                [f for f, _ in learn], [q for _, q in learn], float(ALPHA),
                PRIOR == "learned", terms.__getitem__)
            agreement.compare(decisions, held_files, held_files, vectorizer,
                              model)

            default_vectorizer = CountVectorizer()
            x = default_vectorizer.fit_transform([texts[f] for f, _ in learn])
            default_model = MultinomialNB().fit(x, [q for _, q in learn])
            default_pred += list(default_model.predict(
                default_vectorizer.transform([texts[f] for f in held_files])))
            truth += [q for _, q in held]
            chute_pred += [decisions[f]["queue"] if f in decisions else ""
                           for f in held_files]

        t0 = time.monotonic()
        evaluate_summary, evaluate_failures = evaluate_agreement.check(
            binary, scratch, rows, files, all_decisions, ALPHA, PRIOR)
        evaluate_seconds = time.monotonic() - t0

    def figures(pred):
        return {"accuracy": accuracy_score(truth, pred),
                "macro_f1": f1_score(truth, pred, average="macro",
                                     labels=queues, zero_division=0)}

    results = {
        "corpus": corpus,
        "documents": len(rows),
        "queues": {q: sum(1 for _, r, _ in rows if r == q) for q in queues},
        "folds": FOLDS,
        "chute": {"alpha": float(ALPHA), "prior": PRIOR,
                  **figures(chute_pred)},
        "sklearn_default": {
            "model": "CountVectorizer() + MultinomialNB() on the raw text",
            **figures(default_pred)},
        "agreement_with_sklearn_on_chute_terms": {
            "documents": agreement.documents,
            "log_posteriors": agreement.posteriors,
            "largest_relative_gap": agreement.max_relative_gap,
            "disagreements": agreement.disagreements},
        "chute_evaluate_on_the_same_folds": {
            "summary": evaluate_summary,
            "disagreements": len(evaluate_failures),
            "seconds_learn_and_evaluate": round(evaluate_seconds, 2)},
        "seconds": {"chute_learn_and_route": round(chute_seconds, 2),
                    "total": round(time.monotonic() - started, 2)},
    }
    out_dir = os.path.join(build_dir, "reference-results")
    os.makedirs(out_dir, exist_ok=True)
    out_path = os.path.join(out_dir, f"{corpus}.json")
    with open(out_path, "w", encoding="utf-8") as f:
        json.dump(results, f, indent=2)
        f.write("\n")

    c, d = results["chute"], results["sklearn_default"]
    counts = ", ".join(f"{q} {n}" for q, n in results["queues"].items())
    print(f"{corpus}: {len(rows)} documents ({counts}), {FOLDS}-fold CV")
    print(f"  chute (alpha 1, learned prior):     accuracy {c['accuracy']:.4f}"
          f"  macro-F1 {c['macro_f1']:.4f}")
    print(f"  scikit-learn defaults on raw text:  accuracy {d['accuracy']:.4f}"
          f"  macro-F1 {d['macro_f1']:.4f}")
    print(f"  agreement with MultinomialNB on chute's terms: "
          f"{agreement.summary()}")
    print(f"  chute learn+route {chute_seconds:.1f} s, total "
          f"{results['seconds']['total']:.1f} s; results in {out_path}")
    print(f"  chute evaluate --folds-csv on one store: {evaluate_summary}")
    for message in agreement.failures:
        print(f"  DISAGREES: {message}")
    for message in evaluate_failures[:50]:
        print(f"  EVALUATE DISAGREES: {message}")
    if evaluate_failures:
        sys.exit("FAILED: chute evaluate disagrees with the per-fold stores "
                 "(details above)")
    if agreement.failures:
        sys.exit("FAILED: chute disagrees with scikit-learn's MultinomialNB "
                 "fed chute's own terms (details above)")


if __name__ == "__main__":
    main()
