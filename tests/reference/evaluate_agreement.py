"""`chute evaluate` on given folds against cross-validation done by hand.

corpus_cv.py cross-validates chute the slow, obvious way: for each fold a
fresh store learns the other folds' files and routes the held-out files,
and scikit-learn's MultinomialNB, fed the same terms, must agree with it.
Here one store learns every file once, and `chute evaluate --folds-csv`
runs the same folds by subtracting each fold's stored counts from the
whole (no file is read again). Its predictions must be those of the
per-fold stores: the same queue for every document and every posterior
within 1e-9; and its accuracy and macro-F1 must equal scikit-learn's
accuracy_score and f1_score(average="macro") on the pooled per-fold
decisions, within 1e-12 (scikit-learn 1.2.1, Pedregosa et al., JMLR 12,
2011).
"""

import csv
import json
import os

from sklearn.metrics import accuracy_score, f1_score

import nb_agreement

POSTERIOR_TOLERANCE = 1e-9
FIGURE_TOLERANCE = 1e-12


def check(binary, scratch, rows, files, decisions, alpha, prior):
    """rows: [(rel, queue, fold)]; files: {rel: file}; decisions: {file:
    route decision of its fold's store}. Returns (summary, failures)."""
    whole = nb_agreement.Chute(binary, os.path.join(scratch, "whole.db"))
    whole.init(alpha, prior)
    manifest = os.path.join(scratch, "whole-learn.csv")
    nb_agreement.write_manifest(manifest, [(files[r], q) for r, q, _ in rows])
    whole.learn_csv(manifest)
    folds_csv = os.path.join(scratch, "folds.csv")
    with open(folds_csv, "w", newline="", encoding="utf-8") as f:
        out = csv.writer(f)
        out.writerow(["path", "queue", "fold"])
        out.writerows((files[r], q, k) for r, q, k in rows)
    report_path = os.path.join(scratch, "evaluate.json")
    whole.run("evaluate", "--db", whole.db, "--folds-csv", folds_csv,
              "--json", report_path, "--with-paths", "--with-probabilities")
    with open(report_path, encoding="utf-8") as f:
        report = json.load(f)

    failures = []
    labels = report["confusion"]["labels"]
    by_path = {os.path.normpath(os.path.abspath(k)): v
               for k, v in decisions.items()}
    fold_of = {os.path.normpath(os.path.abspath(files[r])): k
               for r, _, k in rows}
    truth, predicted, largest = [], [], 0.0
    for p in report["predictions"]:
        path = os.path.normpath(p["document"])
        d = by_path.get(path)
        if d is None:
            failures.append(f"{path}: evaluated, but no fold routed it")
            continue
        if p["fold"] != sorted(set(k for _, _, k in rows)).index(
                fold_of[path]) + 1:
            failures.append(f"{path}: in fold {p['fold']} of evaluate, "
                            f"fold {fold_of[path]} of the file")
        truth.append(p["truth"])
        predicted.append(d["queue"])
        if p["queue"] != d["queue"]:
            failures.append(f"{path}: evaluate routes to {p['queue']!r}, "
                            f"its fold's store to {d['queue']!r}")
        for t in d["top"]:
            gap = abs(p["probabilities"][labels.index(t["queue"])] -
                      t["posterior"])
            largest = max(largest, gap)
            if not gap <= POSTERIOR_TOLERANCE:
                failures.append(f"{path}: P({t['queue']}) evaluate "
                                f"{p['probabilities'][labels.index(t['queue'])]!r}"
                                f", fold store {t['posterior']!r}")
    if len(report["predictions"]) != len(rows):
        failures.append(f"evaluate predicted {len(report['predictions'])} "
                        f"documents of {len(rows)}")
    accuracy = accuracy_score(truth, predicted)
    if not abs(report["accuracy"] - accuracy) <= FIGURE_TOLERANCE:
        failures.append(f"accuracy: evaluate {report['accuracy']!r}, "
                        f"scikit-learn {accuracy!r}")
    if report["macro_left_out"]["f1"] == 0:
        macro = f1_score(truth, predicted, labels=labels, average="macro")
        if not abs(report["macro"]["f1"] - macro) <= FIGURE_TOLERANCE:
            failures.append(f"macro-F1: evaluate {report['macro']['f1']!r}, "
                            f"scikit-learn {macro!r}")
    summary = (f"{len(report['predictions'])} documents, same queue and "
               f"posteriors within {largest:.3g} (tolerance "
               f"{POSTERIOR_TOLERANCE:g}); accuracy {report['accuracy']:.4f}, "
               f"macro-F1 {report['macro']['f1']:.4f}")
    return summary, failures
