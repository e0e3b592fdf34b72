#!/usr/bin/python3
"""The peer of `chute learn` in the speed benchmark (tests/bench/run.sh).

    tests/bench/peer_learn.py LEARN_CSV MODEL_PICKLE

Reads the labelled documents listed in LEARN_CSV (RFC 4180, header
path,queue; relative paths relative to the CSV, as chute reads it), counts
their terms with scikit-learn's CountVectorizer, fits MultinomialNB and
pickles both to MODEL_PICKLE. This is the plain way a Python user builds a
multinomial naive Bayes text classifier (scikit-learn user guide, "Working
With Text Data" tutorial and §1.9.2 "Multinomial Naive Bayes"; Pedregosa et
al., "Scikit-learn: Machine Learning in Python", JMLR 12, 2011).

Settings chosen to do the work chute does with its defaults: lower-casing,
words of one character and more (CountVectorizer's default pattern drops
one-character words; chute's --min-length defaults to 1), Laplace smoothing
(alpha = 1), priors learned from the document counts (fit_prior=True).
Files are read by CountVectorizer itself (input="filename"), as UTF-8 with
ill-formed bytes replaced, like chute.
"""

import csv
import os
import pickle
import sys

from sklearn.feature_extraction.text import CountVectorizer
from sklearn.naive_bayes import MultinomialNB

# A word: one or more word characters between word boundaries (Python `re`,
# Unicode). CountVectorizer's default is r"(?u)\b\w\w+\b".
TOKEN_PATTERN = r"(?u)\b\w+\b"


def read_manifest(path):
    base = os.path.dirname(os.path.abspath(path))
    paths, queues = [], []
    with open(path, newline="", encoding="utf-8") as f:
        reader = csv.reader(f)
        header = next(reader)
        if [h.strip() for h in header] != ["path", "queue"]:
            sys.exit("peer_learn: %s: header must be path,queue" % path)
        for row in reader:
            if not row:
                continue
            p, q = row
            paths.append(p if os.path.isabs(p) else os.path.join(base, p))
            queues.append(q)
    return paths, queues


def main():
    if len(sys.argv) != 3:
        sys.exit("usage: peer_learn.py LEARN_CSV MODEL_PICKLE")
    paths, queues = read_manifest(sys.argv[1])
    vectorizer = CountVectorizer(input="filename", encoding="utf-8",
                                 decode_error="replace", lowercase=True,
                                 token_pattern=TOKEN_PATTERN)
    counts = vectorizer.fit_transform(paths)
    model = MultinomialNB(alpha=1.0, fit_prior=True)
    model.fit(counts, queues)
    with open(sys.argv[2], "wb") as f:
        pickle.dump((vectorizer, model), f, protocol=pickle.HIGHEST_PROTOCOL)
    print("peer_learn: %d documents, %d terms, %d queues" %
          (counts.shape[0], counts.shape[1], len(model.classes_)),
          file=sys.stderr)


if __name__ == "__main__":
    main()
