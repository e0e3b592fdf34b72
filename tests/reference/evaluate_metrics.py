#!/usr/bin/python3
"""`chute evaluate`'s figures against scikit-learn's metrics.

    evaluate_metrics.py path/to/chute

Reference: F. Pedregosa et al., "Scikit-learn: Machine Learning in Python",
JMLR 12, 2825-2830 (2011), version 1.2.1 (Debian python3-sklearn):
sklearn.metrics.accuracy_score, precision_recall_fscore_support,
confusion_matrix, log_loss, brier_score_loss, and
sklearn.calibration.calibration_curve (source read in
/usr/lib/python3/dist-packages/sklearn/metrics/_classification.py and
sklearn/calibration.py).

A seeded generator writes a labelled corpus of five queues of very
different sizes, with overlapping vocabularies so that confidences spread
out and mistakes happen; one queue ("delta") uses only another queue's
words, so nothing is ever routed to it and its precision is undefined;
another ("omega") has fewer documents than folds. chute learns it, then

  1. `chute evaluate --folds 5 --target-accuracy 0.9 --json ...
     --with-probabilities` (cross-validation), and
  2. `chute evaluate --holdout DIR --json ... --with-probabilities` on a
     generated holdout that also holds a queue the store never learned,

and every figure of each report is recomputed here from its `predictions`
(true queue, chosen queue, confidence and the posterior of every queue, in
the order of `confusion.labels`) with scikit-learn, and must agree within
1e-12 (counts exactly). The holdout's posteriors are also checked against
`chute route --format jsonl --top <all>` on the same files, so the
predictions are the routing command's own.
"""

import json
import math
import os
import random
import subprocess
import sys
import tempfile

import numpy as np
from sklearn.calibration import calibration_curve
from sklearn.metrics import (accuracy_score, brier_score_loss,
                             confusion_matrix, log_loss,
                             precision_recall_fscore_support)

SEED = 20261202
TOLERANCE = 1e-12
# queue: (learned documents, holdout documents, own-word share)
QUEUES = {
    "alpha": (70, 20, 0.45),
    "beta": (40, 12, 0.35),
    "gamma": (18, 6, 0.25),
    "delta": (6, 4, None),   # only alpha's own words: never routed to
    "omega": (3, 2, 0.5),    # fewer documents than folds
}
UNKNOWN_QUEUE = ("zeta", 3)  # in the holdout only


class Checker:
    def __init__(self):
        self.failures = []
        self.checks = 0

    def close(self, what, got, expected, tol=TOLERANCE):
        self.checks += 1
        if got is None or expected is None:
            if got is not expected:
                self.failures.append(f"{what}: chute {got!r}, reference "
                                     f"{expected!r}")
            return
        if not abs(got - expected) <= tol:
            self.failures.append(f"{what}: chute {got!r}, reference "
                                 f"{expected!r} (difference "
                                 f"{abs(got - expected):.3g})")

    def equal(self, what, got, expected):
        self.checks += 1
        if got != expected:
            self.failures.append(f"{what}: chute {got!r}, reference "
                                 f"{expected!r}")

    def true(self, what, condition):
        self.checks += 1
        if not condition:
            self.failures.append(what)


def write_corpus(root, rng, sizes, vocab):
    """root/<queue>/<n>.txt; sizes[queue] documents each."""
    for queue, n in sizes.items():
        os.makedirs(os.path.join(root, queue), exist_ok=True)
        for i in range(n):
            share = QUEUES.get(queue, (0, 0, 0.3))[2]
            own = vocab["alpha"] if share is None else vocab[queue]
            share = 0.5 if share is None else share
            length = rng.randint(4, 18)
            words = [rng.choice(own) if rng.random() < share
                     else rng.choice(vocab["_shared"]) for _ in range(length)]
            with open(os.path.join(root, queue, f"{i:03d}.txt"), "w",
                      encoding="utf-8") as f:
                f.write(" ".join(words) + "\n")


def make_vocab(rng):
    letters = "abcdefghijklmnopqrstuvwxyz"
    taken, vocab = set(), {}

    def words(n):
        out = []
        while len(out) < n:
            w = "".join(rng.choice(letters) for _ in range(rng.randint(3, 8)))
            if w not in taken:
                taken.add(w)
                out.append(w)
        return out
    vocab["_shared"] = words(120)
    for queue in list(QUEUES) + [UNKNOWN_QUEUE[0]]:
        vocab[queue] = words(40)
    return vocab


def run(binary, *args):
    r = subprocess.run([binary, *args], capture_output=True, text=True)
    if r.returncode not in (0, 3):
        sys.exit(f"FAILED: chute {' '.join(args)} exited with "
                 f"{r.returncode}:\n{r.stderr}")
    return r


def check_report(c, name, report):
    """Recomputes every figure of one report with scikit-learn."""
    labels = report["confusion"]["labels"]
    preds = report["predictions"]
    y_true = [p["truth"] for p in preds]
    y_pred = [p["queue"] for p in preds]
    proba = np.array([p["probabilities"] for p in preds], dtype=np.float64)
    conf = np.array([p["confidence"] for p in preds], dtype=np.float64)
    correct = np.array([t == q for t, q in zip(y_true, y_pred)], dtype=int)
    c.equal(f"{name}: documents", report["documents"], len(preds))
    c.true(f"{name}: probabilities sum to 1",
           np.all(np.abs(proba.sum(axis=1) - 1) < 1e-12))
    c.true(f"{name}: confidence is the chosen queue's posterior",
           all(proba[i][labels.index(y_pred[i])] == conf[i]
               for i in range(len(preds))))

    # sklearn.metrics.accuracy_score
    c.close(f"{name}: accuracy", report["accuracy"],
            accuracy_score(y_true, y_pred))
    # sklearn.metrics.confusion_matrix, rows true (its documentation: "the
    # number of observations known to be in group i and predicted to be in
    # group j")
    c.equal(f"{name}: confusion matrix", report["confusion"]["matrix"],
            confusion_matrix(y_true, y_pred, labels=labels).tolist())
    # sklearn.metrics.precision_recall_fscore_support: compared on the
    # defined cells; chute's null must stand exactly where the reference
    # divides by zero (nothing routed to the queue for precision, no
    # document for recall, neither for F1).
    p, r, f, s = precision_recall_fscore_support(
        y_true, y_pred, labels=labels, zero_division=0)
    routed = [y_pred.count(q) for q in labels]
    undefined = 0
    for i, q in enumerate(labels):
        row = report["per_queue"][i]
        c.equal(f"{name}: per_queue[{i}].queue", row["queue"], q)
        c.equal(f"{name}: support of {q}", row["support"], int(s[i]))
        for key, ref, defined in (("precision", p[i], routed[i] > 0),
                                  ("recall", r[i], s[i] > 0),
                                  ("f1", f[i], routed[i] + s[i] > 0)):
            if defined:
                c.close(f"{name}: {key} of {q}", row[key], float(ref))
            else:
                undefined += 1
                c.equal(f"{name}: {key} of {q} (undefined)", row[key], None)
    # Macro and weighted averages over the defined cells, from the
    # reference's per-queue figures; where no cell is undefined, also the
    # reference's own average="macro" / "weighted".
    for key, ref in (("precision", p), ("recall", r), ("f1", f)):
        defined = [i for i in range(len(labels))
                   if {"precision": routed[i] > 0, "recall": s[i] > 0,
                       "f1": routed[i] + s[i] > 0}[key]]
        c.close(f"{name}: macro {key}", report["macro"][key],
                float(np.mean([ref[i] for i in defined])))
        c.equal(f"{name}: macro_left_out {key}", report["macro_left_out"][key],
                len(labels) - len(defined))
        weights = [s[i] for i in defined]
        c.close(f"{name}: weighted {key}", report["weighted"][key],
                float(np.average([ref[i] for i in defined], weights=weights))
                if sum(weights) > 0 else None)
        if len(defined) == len(labels):
            for avg in ("macro", "weighted"):
                whole = precision_recall_fscore_support(
                    y_true, y_pred, labels=labels, average=avg,
                    zero_division=0)
                c.close(f"{name}: sklearn average={avg} {key}",
                        report[avg][key],
                        float(whole[("precision", "recall", "f1").index(key)]))
    # Micro averaging pools the contingency tables (Manning, Raghavan &
    # Schütze 2008, §13.6); in single-label routing it equals accuracy.
    micro = precision_recall_fscore_support(y_true, y_pred, labels=labels,
                                            average="micro")
    for k, key in enumerate(("precision", "recall", "f1")):
        c.close(f"{name}: micro {key}", report["micro"][key], float(micro[k]))
        c.close(f"{name}: micro {key} = accuracy", report["micro"][key],
                report["accuracy"])

    # sklearn.metrics.log_loss, default eps="auto" (np.finfo(float64).eps
    # clipping, then renormalisation), on the same labels.
    c.close(f"{name}: log loss", report["log_loss"],
            log_loss(y_true, proba, labels=labels))
    c.equal(f"{name}: log_loss_clip", report["log_loss_clip"],
            float(np.finfo(np.float64).eps))
    # Multiclass Brier score (Brier 1950) = sum over queues of the
    # one-vs-rest sklearn.metrics.brier_score_loss.
    brier = sum(brier_score_loss([1 if t == q else 0 for t in y_true],
                                 proba[:, j], pos_label=1)
                for j, q in enumerate(labels))
    c.close(f"{name}: Brier", report["brier"], float(brier))

    # sklearn.calibration.calibration_curve(n_bins=10, strategy="uniform")
    # on (correct, confidence): it returns the non-empty bins only; their
    # counts are recomputed with the same numpy calls its source uses.
    prob_true, prob_pred = calibration_curve(correct, conf, n_bins=10,
                                             strategy="uniform")
    edges = np.linspace(0.0, 1.0, 11)
    counts = np.bincount(np.searchsorted(edges[1:-1], conf), minlength=10)
    bins = report["reliability"]
    c.equal(f"{name}: reliability counts", [b["count"] for b in bins],
            counts[:10].tolist())
    nonempty = [b for b in bins if b["count"] > 0]
    c.equal(f"{name}: non-empty bins", len(nonempty), len(prob_true))
    for b, pt, pp in zip(nonempty, prob_true, prob_pred):
        c.close(f"{name}: bin {b['bin_low']} accuracy", b["accuracy"],
                float(pt))
        c.close(f"{name}: bin {b['bin_low']} mean confidence",
                b["mean_confidence"], float(pp))
    for m, b in enumerate(bins):
        c.close(f"{name}: bin {m} edges", b["bin_low"], m / 10, 0)
        c.close(f"{name}: bin {m} edges", b["bin_high"], (m + 1) / 10, 0)
        if b["count"] == 0:
            c.true(f"{name}: empty bin {m} has null figures",
                   b["accuracy"] is None and b["mean_confidence"] is None)
    # Expected calibration error, C. Guo et al., "On Calibration of Modern
    # Neural Networks", ICML 2017, eq. 3, from the reference's bins.
    n = len(preds)
    ece = sum(cnt / n * abs(pt - pp) for cnt, pt, pp in
              zip([x for x in counts if x > 0], prob_true, prob_pred))
    c.close(f"{name}: ECE", report["ece"], float(ece))

    # Threshold sweep: t = h/100; automatic when confidence >= t.
    for h, point in enumerate(report["sweep"]):
        t = h / 100
        auto = conf >= t
        docs = int(auto.sum())
        c.close(f"{name}: sweep threshold {h}", point["threshold"], t, 0)
        c.equal(f"{name}: sweep documents at {t}", point["documents"], docs)
        c.close(f"{name}: sweep share at {t}", point["auto_share"], docs / n)
        c.close(f"{name}: sweep accuracy at {t}", point["accuracy"],
                float(correct[auto].mean()) if docs else None)
    target = (report["recommended"] or {}).get("target_accuracy")
    if target is not None:
        best = None
        for point in reversed(report["sweep"]):
            if point["documents"] == 0:
                continue
            if point["accuracy"] < target:
                break
            best = point
        rec = report["recommended"]
        c.equal(f"{name}: recommended threshold", rec["threshold"],
                best["threshold"] if best else None)
        c.equal(f"{name}: recommended documents", rec["documents"],
                best["documents"] if best else None)
    return undefined


def main():
    if len(sys.argv) != 2:
        sys.exit("usage: evaluate_metrics.py path/to/chute")
    binary = os.path.abspath(sys.argv[1])
    rng = random.Random(SEED)
    vocab = make_vocab(rng)
    c = Checker()
    with tempfile.TemporaryDirectory(prefix="chute-evaluate-") as tmp:
        learn, hold = os.path.join(tmp, "labelled"), os.path.join(tmp, "hold")
        write_corpus(learn, rng, {q: v[0] for q, v in QUEUES.items()}, vocab)
        holdout_sizes = {q: v[1] for q, v in QUEUES.items()}
        holdout_sizes[UNKNOWN_QUEUE[0]] = UNKNOWN_QUEUE[1]
        write_corpus(hold, rng, holdout_sizes, vocab)
        db = os.path.join(tmp, "s.db")
        run(binary, "init", "--db", db)
        run(binary, "learn", "--db", db, "--tree", learn)

        cv_json = os.path.join(tmp, "cv.json")
        r = run(binary, "evaluate", "--db", db, "--folds", "5",
                "--target-accuracy", "0.9", "--json", cv_json,
                "--with-probabilities")
        with open(cv_json, encoding="utf-8") as f:
            cv = json.load(f)
        undefined_cv = check_report(c, "cross-validation", cv)
        c.true("cross-validation: a queue with fewer documents than folds "
               "is warned about",
               any("'omega'" in w for w in cv["warnings"]) and
               "'omega'" in r.stderr)

        hold_json = os.path.join(tmp, "hold.json")
        run(binary, "evaluate", "--db", db, "--holdout", hold, "--json",
            hold_json, "--with-probabilities", "--with-paths")
        with open(hold_json, encoding="utf-8") as f:
            ho = json.load(f)
        undefined_ho = check_report(c, "holdout", ho)
        c.true("holdout: the unknown queue is a label",
               UNKNOWN_QUEUE[0] in ho["confusion"]["labels"])
        c.true("holdout: the unknown queue is warned about",
               any(f"'{UNKNOWN_QUEUE[0]}'" in w for w in ho["warnings"]))
        # The holdout's posteriors are those of `chute route`.
        routed = subprocess.run(
            [binary, "route", "--db", db, "--format", "jsonl", "--top", "99",
             hold], capture_output=True, text=True, check=True).stdout
        labels = ho["confusion"]["labels"]
        by_file = {}
        for line in routed.splitlines():
            d = json.loads(line)
            by_file[d["file"]] = d
        for p in ho["predictions"]:
            d = by_file.get(p["document"])
            if d is None:
                c.true(f"holdout: {p['document']} routed", False)
                continue
            c.equal(f"holdout: queue of {p['document']}", p["queue"],
                    d["queue"])
            for t in d["top"]:
                c.close(f"holdout: P({t['queue']}) of {p['document']}",
                        p["probabilities"][labels.index(t["queue"])],
                        t["posterior"], 0)
        c.true("the corpus leaves some figure undefined (so null is tested)",
               undefined_cv + undefined_ho > 0)

    for message in c.failures[:50]:
        print("DIFFERS:", message)
    if c.failures:
        sys.exit(f"FAILED: {len(c.failures)} of {c.checks} checks differ "
                 f"from scikit-learn")
    print(f"chute evaluate agrees with scikit-learn 1.2.1: {c.checks} checks "
          f"(cross-validation {cv['documents']} documents, accuracy "
          f"{cv['accuracy']:.4f}; holdout {ho['documents']} documents, "
          f"accuracy {ho['accuracy']:.4f}); "
          f"{undefined_cv + undefined_ho} undefined cells are null")


if __name__ == "__main__":
    main()
