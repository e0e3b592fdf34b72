"""Runs chute and scikit-learn's multinomial naive Bayes side by side.

The outside reference is scikit-learn: F. Pedregosa et al., "Scikit-learn:
Machine Learning in Python", Journal of Machine Learning Research 12,
2825-2830 (2011); version 1.2.1 from Debian's python3-sklearn. Its
MultinomialNB (documentation: scikit-learn user guide §1.9.2 "Multinomial
Naive Bayes", and the API page sklearn.naive_bayes.MultinomialNB) estimates

    theta_yi = (N_yi + alpha) / (N_y + alpha * n)

with n the number of features, i.e. the terms of the fitted vocabulary, and
the class prior from class frequencies (fit_prior=True) or uniform
(fit_prior=False). Fed the same term counts this is DESIGN.md's model, so
chute's decisions and log posteriors must agree with it to rounding.
"""

import csv
import json
import math
import subprocess

from sklearn.feature_extraction.text import CountVectorizer
from sklearn.naive_bayes import MultinomialNB

# |chute - reference| <= RELATIVE_TOLERANCE * max(1, |reference|) for every
# log posterior. Both sides sum the same terms in double precision in a
# different order, so they differ by a few ulps of the largest partial sum.
RELATIVE_TOLERANCE = 1e-9


class Chute:
    """The chute binary, run on one store."""

    def __init__(self, binary, db):
        self.binary = binary
        self.db = db

    def run(self, *args):
        command = [self.binary, *args]
        result = subprocess.run(command, capture_output=True, text=True)
        if result.returncode != 0:
            shown = " ".join(command)
            if len(shown) > 300:
                shown = shown[:300] + " ..."
            raise AssertionError(
                f"`{shown}` exited with {result.returncode}:\n"
                f"{result.stderr.strip()[:2000]}")
        return result.stdout

    def init(self, alpha, prior):
        self.run("init", "--db", self.db, "--alpha", str(alpha),
                 "--prior", prior)

    def learn_csv(self, manifest):
        self.run("learn", "--db", self.db, "--csv", manifest)

    def route(self, files, top):
        """{file as given: decision object} for each routed file."""
        out = self.run("route", "--db", self.db, "--format", "jsonl",
                       "--top", str(top), *files)
        decisions = {}
        for line in out.splitlines():
            d = json.loads(line)
            decisions[d["file"]] = d
        return decisions

    def terms_of(self, files):
        """{file as given: [terms]} for each file."""
        out = self.run("terms-of", "--db", self.db, "--format", "jsonl",
                       *files)
        terms = {}
        for line in out.splitlines():
            d = json.loads(line)
            terms[d["file"]] = d["terms"]
        return terms


def write_manifest(path, rows):
    """A chute learning manifest (CSV, header path,queue)."""
    with open(path, "w", newline="", encoding="utf-8") as f:
        out = csv.writer(f)
        out.writerow(["path", "queue"])
        out.writerows(rows)


def fit_reference(train_docs, train_queues, alpha, fit_prior, analyzer):
    """Fits scikit-learn's CountVectorizer + MultinomialNB."""
    vectorizer = CountVectorizer(analyzer=analyzer)
    x = vectorizer.fit_transform(train_docs)
    model = MultinomialNB(alpha=alpha, fit_prior=fit_prior)
    model.fit(x, train_queues)
    return vectorizer, model


class Agreement:
    """Compares chute's decisions with the reference's, document by
    document, and collects every disagreement."""

    def __init__(self):
        self.documents = 0
        self.posteriors = 0
        self.ties = 0
        self.no_terms = 0
        self.max_relative_gap = 0.0
        self.disagreements = 0
        self.failures = []  # the first 50 disagreements, in words

    def fail(self, message):
        self.disagreements += 1
        if len(self.failures) < 50:
            self.failures.append(message)
        elif len(self.failures) == 50:
            self.failures.append("(further disagreements not shown)")

    def compare(self, decisions, files, docs, vectorizer, model):
        """decisions: chute's route output by file; files[i] is the name
        chute was given for docs[i], the reference's input."""
        x = vectorizer.transform(docs)
        joint = model.predict_joint_log_proba(x)
        log_post = model.predict_log_proba(x)
        queues = list(model.classes_)
        for i, name in enumerate(files):
            self.documents += 1
            d = decisions.get(name)
            if d is None:
                self.fail(f"{name}: chute gave no decision")
                continue
            # The reference's winner; an exact tie (as for a document with
            # no known term under a uniform prior) accepts any tied queue.
            best = joint[i].max()
            winners = {queues[j] for j in range(len(queues))
                       if joint[i][j] == best}
            if len(winners) > 1:
                self.ties += 1
            if d["queue"] not in winners:
                self.fail(f"{name}: chute routes to {d['queue']!r}, "
                          f"scikit-learn to {sorted(winners)}")
            known = x[i].nnz > 0
            if not known:
                self.no_terms += 1
            if d.get("no_terms") != (not known):
                self.fail(f"{name}: chute no_terms={d.get('no_terms')}, but "
                          f"the document has {x[i].sum()} known terms")
            top = {t["queue"]: t for t in d["top"]}
            if sorted(top) != sorted(queues) or len(d["top"]) != len(queues):
                self.fail(f"{name}: chute's top lists {sorted(top)}, "
                          f"expected every queue once: {sorted(queues)}")
                continue
            if d["top"][0]["queue"] != d["queue"]:
                self.fail(f"{name}: top[0] is {d['top'][0]['queue']!r}, "
                          f"not the winner {d['queue']!r}")
            for j, q in enumerate(queues):
                self.posteriors += 1
                ref = float(log_post[i][j])
                got = top[q]["log_posterior"]
                gap = abs(got - ref) / max(1.0, abs(ref))
                self.max_relative_gap = max(self.max_relative_gap, gap)
                if not gap <= RELATIVE_TOLERANCE:
                    self.fail(f"{name}: log P({q}|d) chute {got!r}, "
                              f"scikit-learn {ref!r} (relative gap {gap:.3g})")
                if not abs(top[q]["posterior"] - math.exp(ref)) <= 1e-9:
                    self.fail(f"{name}: P({q}|d) chute {top[q]['posterior']!r}"
                              f", scikit-learn {math.exp(ref)!r}")
            conf = d["confidence"]
            if not abs(conf - top[d["queue"]]["posterior"]) <= 1e-12:
                self.fail(f"{name}: confidence {conf!r} is not the winner's "
                          f"posterior {top[d['queue']]['posterior']!r}")

    def summary(self):
        return (f"{self.documents} documents, {self.posteriors} log "
                f"posteriors compared, largest relative gap "
                f"{self.max_relative_gap:.3g} (tolerance {RELATIVE_TOLERANCE:g})"
                f", {self.ties} exact ties, {self.no_terms} without known "
                f"terms, {self.disagreements} disagreements")

