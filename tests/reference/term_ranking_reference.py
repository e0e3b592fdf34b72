#!/usr/bin/python3
"""`chute terms` against outside references, on a generated corpus.

    term_ranking_reference.py path/to/chute

A seeded generator writes documents of space-separated lowercase ASCII words
for four queues of different sizes (each word drawn from a shared Zipf
distribution or from a queue's own). On such text chute's terms are exactly
the words, so this script can count them itself. chute learns the documents
(`learn --tree`) and prints its rankings as JSON Lines; every listed figure
is checked against:

1. log-odds: the weighted log-odds ratio with an informative Dirichlet prior
   of B. L. Monroe, M. P. Colaresi & K. M. Quinn, "Fightin' Words: Lexical
   Feature Selection and Evaluation for Identifying the Content of Political
   Conflict", Political Analysis 16(4), 372-403 (2008), §3.5, written out
   below with numpy, independently of chute's code (see log_odds_reference).
   The equation numbers cited there are recalled from memory.
2. chi2: Pearson's X² of the 2x2 table of documents (term present or not,
   in the queue or not), C. D. Manning, P. Raghavan & H. Schütze,
   Introduction to Information Retrieval (2008), §13.5.2, eq. 13.18, through
   scikit-learn 1.2.1 (Pedregosa et al., JMLR 12, 2011; Debian
   python3-sklearn) sklearn.feature_selection.chi2. That function, given a
   binary document-term column x and the labels "in the queue or not",
   sums (observed - expected)² / expected over the two classes for the
   documents that CONTAIN the term only (observed = per-class sums of x), so
   on x alone it is not the 2x2 X². Run on the complement column 1 - x it
   gives the other row of the table; chi2(x) + chi2(1 - x) is the full X²
   of eq. 13.18, and that sum is what is asserted.
3. mi: the expected mutual information of eq. 13.17 (same book, §13.5.1),
   through sklearn.metrics.mutual_info_score(contains_term, in_queue), which
   is in nats: chute's bits times ln 2.

Also asserted: which terms are listed (count in the queue >= --min-count;
positively associated: delta > 0 for log-odds, N11*N00 > N10*N01 for chi2
and mi), the order (score descending, ties by term), --top, and the counts
and rates per 10,000. Values agree within 1e-9 * max(1, |reference|).

Finally, as a check of the reference itself, scikit-learn reproduces the
book's worked examples (Example 13.3: I(U;C) ~ 0.0001105 bits and
Example 13.4: X² ~ 284 for "export" in class "poultry", Reuters-RCV1,
N11 = 49, N10 = 27,652, N01 = 141, N00 = 774,106; both printed values are
recalled from memory and agree with the computed 0.00011054 and 284.29).
"""

import json
import math
import os
import random
import subprocess
import sys
import tempfile

import numpy as np
from sklearn.feature_selection import chi2 as sk_chi2
from sklearn.metrics import mutual_info_score

SEED = 20081
TOLERANCE = 1e-9
# queue: (documents, median length, own words)
QUEUES = {
    "harbour": (40, 30, 25),
    "customs": (25, 60, 20),
    "payroll": (12, 20, 15),
    "tenders": (6, 80, 10),
}
SHARED_WORDS = 120
OWN_SHARE = 0.25  # chance that a word comes from the queue's own words

failures = []


def check(ok, message):
    if not ok:
        failures.append(message)


def close(a, b):
    return abs(a - b) <= TOLERANCE * max(1.0, abs(b))


def make_corpus(rng):
    taken = set()

    def words(n):
        out = []
        while len(out) < n:
            w = "".join(rng.choice("abcdefghijklmnopqrstuvwxyz")
                        for _ in range(rng.randint(3, 9)))
            if w not in taken:
                taken.add(w)
                out.append(w)
        return out

    shared = words(SHARED_WORDS)
    zipf = [1.0 / (r + 1) for r in range(len(shared))]
    docs = []  # (queue, [words])
    for queue, (n_docs, median, n_own) in QUEUES.items():
        own = words(n_own)
        own_weights = [1.0 / (r + 1) ** 0.7 for r in range(n_own)]
        for _ in range(n_docs):
            length = max(1, int(rng.lognormvariate(math.log(median), 0.5)))
            doc = []
            for _ in range(length):
                if rng.random() < OWN_SHARE:
                    doc.append(rng.choices(own, own_weights)[0])
                else:
                    doc.append(rng.choices(shared, zipf)[0])
            docs.append((queue, doc))
    return docs


def run(chute, args, cwd):
    r = subprocess.run([chute] + args, cwd=cwd, capture_output=True, text=True)
    if r.returncode != 0:
        sys.exit(f"chute {' '.join(args)} failed ({r.returncode}): {r.stderr}")
    return r.stdout


class Counts:
    """Occurrences and documents per (queue, term), counted here."""

    def __init__(self, docs):
        self.queues = sorted({q for q, _ in docs})
        self.terms = sorted({w for _, d in docs for w in d})
        qi = {q: i for i, q in enumerate(self.queues)}
        ti = {t: i for i, t in enumerate(self.terms)}
        self.occurrences = np.zeros((len(self.queues), len(self.terms)))
        # Binary document-term matrix and labels, one row per document.
        self.present = np.zeros((len(docs), len(self.terms)), dtype=np.int64)
        self.labels = np.array([qi[q] for q, _ in docs])
        for row, (q, d) in enumerate(docs):
            for w in d:
                self.occurrences[qi[q], ti[w]] += 1
                self.present[row, ti[w]] = 1


def log_odds_reference(c, q, alpha0):
    """Monroe, Colaresi & Quinn (2008), §3.5, queue q against the rest.

    y_i, y_j: occurrences of w in q and in the other queues; n_i, n_j their
    totals; alpha_w = alpha0 * y_w / n (an informative Dirichlet prior from
    w's share of all counted terms, alpha_0 = sum of alpha_w):
      delta_w  = log((y_i + a_w) / (n_i + a0 - y_i - a_w))
               - log((y_j + a_w) / (n_j + a0 - y_j - a_w))      (eq. 16)
      sigma2_w = 1 / (y_i + a_w) + 1 / (y_j + a_w)             (eq. 19-20)
      z_w      = delta_w / sqrt(sigma2_w)                       (eq. 22)
    """
    y_i = c.occurrences[q]
    y_j = c.occurrences.sum(axis=0) - y_i
    n_i, n_j = y_i.sum(), y_j.sum()
    y, n = y_i + y_j, n_i + n_j
    a_w = alpha0 * y / n
    delta = (np.log((y_i + a_w) / (n_i + alpha0 - y_i - a_w))
             - np.log((y_j + a_w) / (n_j + alpha0 - y_j - a_w)))
    sigma2 = 1.0 / (y_i + a_w) + 1.0 / (y_j + a_w)
    return delta, delta / np.sqrt(sigma2)


def contingency(c, q, t):
    in_q = c.labels == q
    has = c.present[:, t] == 1
    n11 = int(np.sum(has & in_q))
    n10 = int(np.sum(has & ~in_q))
    n01 = int(np.sum(~has & in_q))
    n00 = int(np.sum(~has & ~in_q))
    return n11, n10, n01, n00


def chi2_reference(c, q, t):
    y = (c.labels == q).astype(np.int64)
    x = c.present[:, [t]]
    with np.errstate(divide="ignore", invalid="ignore"):
        a, _ = sk_chi2(x, y)
        b, _ = sk_chi2(1 - x, y)
    return float(a[0] + b[0])


def mi_reference(c, q, t):
    return mutual_info_score(c.present[:, t], (c.labels == q).astype(np.int64)) / math.log(2)


def expected_listing(c, q, method, min_count, alpha0):
    """[(term, score, extra)] of every term chute should list for queue q."""
    rows = []
    if method == "log-odds":
        delta, z = log_odds_reference(c, q, alpha0)
    for t, term in enumerate(c.terms):
        if c.occurrences[q, t] < min_count:
            continue
        if method == "log-odds":
            if delta[t] > 0:
                rows.append((term, float(z[t]), float(delta[t])))
            continue
        n11, n10, n01, n00 = contingency(c, q, t)
        if n11 * n00 <= n10 * n01:
            continue
        score = chi2_reference(c, q, t) if method == "chi2" else mi_reference(c, q, t)
        rows.append((term, score, None))
    return rows


def check_listing(c, method, min_count, alpha0, top, records):
    label = f"{method} min-count {min_count} prior {alpha0} top {top}"
    by_queue = {}
    for r in records:
        by_queue.setdefault(r["queue"], []).append(r)
    check(list(by_queue) == [q for q in c.queues if q in by_queue],
          f"{label}: queues not in name order: {list(by_queue)}")
    total = c.occurrences.sum()
    for q, queue in enumerate(c.queues):
        got = by_queue.get(queue, [])
        want = expected_listing(c, q, method, min_count, alpha0)
        score_key = "z" if method == "log-odds" else "score"
        # Order: chute's own scores descending, ties by term.
        keys = [(-r[score_key], r["term"]) for r in got]
        check(keys == sorted(keys), f"{label} {queue}: not best first")
        check(len(got) == min(top, len(want)),
              f"{label} {queue}: {len(got)} terms listed, expected {min(top, len(want))}")
        # The listed terms are the reference's best, up to exact ties at
        # the cut (compared by score, so rounding cannot flip a near tie).
        want_sorted = sorted(want, key=lambda w: (-w[1], w[0]))
        for k, r in enumerate(got[:len(want_sorted)]):
            check(close(r[score_key], want_sorted[k][1]),
                  f"{label} {queue}: score #{k} {r[score_key]} vs {want_sorted[k][1]}")
        want_by_term = {w[0]: w for w in want}
        n_i = c.occurrences[q].sum()
        n_j = total - n_i
        for r in got:
            term = r["term"]
            if term not in want_by_term:
                check(False, f"{label} {queue}: {term} listed but not expected")
                continue
            t = c.terms.index(term)
            _, score, delta = want_by_term[term]
            y_i = c.occurrences[q, t]
            y_j = c.occurrences[:, t].sum() - y_i
            check(r["count"] == int(y_i), f"{label} {queue} {term}: count {r['count']} vs {y_i}")
            check(close(r["rate_in"], 1e4 * y_i / n_i), f"{label} {queue} {term}: rate_in")
            check(close(r["rate_out"], 1e4 * y_j / n_j), f"{label} {queue} {term}: rate_out")
            check(close(r[score_key], score),
                  f"{label} {queue} {term}: {score_key} {r[score_key]} vs {score}")
            if method == "log-odds":
                check(close(r["log_odds"], delta),
                      f"{label} {queue} {term}: log_odds {r['log_odds']} vs {delta}")


def check_reference_on_book_examples():
    """scikit-learn on Manning et al. (2008), Examples 13.3 and 13.4."""
    n11, n10, n01, n00 = 49, 27652, 141, 774106
    table = np.array([[n11, n10], [n01, n00]])
    mi = mutual_info_score(None, None, contingency=table) / math.log(2)
    check(abs(mi - 0.0001105) < 0.5e-7, f"book Example 13.3: sklearn MI {mi}")
    n = n11 + n10 + n01 + n00
    x = np.zeros((n, 1), dtype=np.int8)
    y = np.zeros(n, dtype=np.int8)
    x[:n11 + n10] = 1
    y[:n11] = 1
    y[n11 + n10:n11 + n10 + n01] = 1
    a, _ = sk_chi2(x, y)
    b, _ = sk_chi2(1 - x, y)
    chi = float(a[0] + b[0])
    check(abs(chi - 284) < 0.5, f"book Example 13.4: sklearn chi2 {chi}")


def main():
    if len(sys.argv) != 2:
        sys.exit(__doc__)
    chute = os.path.abspath(sys.argv[1])
    check_reference_on_book_examples()
    rng = random.Random(SEED)
    docs = make_corpus(rng)
    c = Counts(docs)
    with tempfile.TemporaryDirectory() as tmp:
        for i, (queue, words) in enumerate(docs):
            path = os.path.join(tmp, "l", queue, f"{i:04d}.txt")
            os.makedirs(os.path.dirname(path), exist_ok=True)
            with open(path, "w") as f:
                f.write(" ".join(words) + "\n")
        run(chute, ["init", "--db", "s.db"], tmp)
        run(chute, ["learn", "--db", "s.db", "--tree", "l"], tmp)
        # chute's terms are the words: its vocabulary is ours.
        settings = json.loads(run(chute, ["queues", "--db", "s.db", "--settings",
                                          "--format", "jsonl"], tmp))
        check(settings["vocabulary"] == len(c.terms),
              f"vocabulary {settings['vocabulary']} vs {len(c.terms)} words")
        cases = [
            ("log-odds", 5, 500, 25), ("log-odds", 1, 500, 10**6),
            ("log-odds", 3, 20, 10**6), ("log-odds", 2, 5000, 7),
            ("chi2", 5, 500, 25), ("chi2", 1, 500, 10**6),
            ("mi", 5, 500, 25), ("mi", 1, 500, 10**6),
        ]
        for method, min_count, alpha0, top in cases:
            out = run(chute, ["terms", "--db", "s.db", "--format", "jsonl",
                              "--method", method, "--min-count", str(min_count),
                              "--prior-strength", str(alpha0), "--top", str(top)], tmp)
            records = [json.loads(line) for line in out.splitlines()]
            check(len(records) > 0, f"{method}: nothing listed")
            check_listing(c, method, min_count, alpha0, top, records)
            print(f"{method:8} min-count {min_count} prior {alpha0:5} top {top:7}: "
                  f"{len(records)} terms checked")
    if failures:
        for f in failures[:30]:
            print("FAIL", f)
        sys.exit(f"{len(failures)} failures")
    print("all agree")


if __name__ == "__main__":
    main()
