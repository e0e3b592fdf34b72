#!/usr/bin/python3
"""Outside yardstick for the demo corpus: trains scikit-learn's multinomial
naive Bayes on labelled/ and routes the inbox, then prints the accuracy
against inbox-key.csv and the recall of each queue.

Reference: F. Pedregosa et al., "Scikit-learn: Machine Learning in Python",
Journal of Machine Learning Research 12 (2011) 2825-2830; the classifier is
sklearn.naive_bayes.MultinomialNB (Laplace smoothing, alpha = 1, learned
priors) fed the term counts of sklearn.feature_extraction.text.
CountVectorizer with its default settings (lowercase, words of two or more
word characters). That tokenizer does not split Japanese into words, so
--cjk-bigrams counts pairs of adjacent CJK characters instead, a common
practice for unsegmented scripts.

Usage: corpora/sklearn_check.py [--cjk-bigrams] [CORPUS_DIR]
       (CORPUS_DIR defaults to corpora/port-authority)
Needs Debian's python3-sklearn; use /usr/bin/python3.
"""

import argparse
import csv
import os
import re
import sys
import unicodedata

from sklearn.feature_extraction.text import CountVectorizer
from sklearn.naive_bayes import MultinomialNB

CJK_RUN = re.compile(r"[\u3040-\u30ff\u3400-\u9fff]+")


def cjk_bigram_terms(text):
    """Word tokens for alphabetic scripts, character pairs inside CJK runs."""
    terms = []
    for token in re.findall(r"\w+", unicodedata.normalize("NFKC", text).casefold()):
        for piece in re.split(r"([\u3040-\u30ff\u3400-\u9fff]+)", token):
            if not piece:
                continue
            if CJK_RUN.fullmatch(piece):
                terms += [piece[i:i + 2] for i in range(max(1, len(piece) - 1))]
            else:
                terms.append(piece)
    return terms


def read(path):
    with open(path, encoding="utf-8") as f:
        return f.read()


def main(argv):
    here = os.path.dirname(os.path.abspath(__file__))
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("corpus", nargs="?", default=os.path.join(here, "port-authority"))
    parser.add_argument("--cjk-bigrams", action="store_true",
                        help="count CJK character pairs instead of CountVectorizer's words")
    args = parser.parse_args(argv)

    labelled = os.path.join(args.corpus, "labelled")
    texts, queues = [], []
    for queue in sorted(os.listdir(labelled)):
        for name in sorted(os.listdir(os.path.join(labelled, queue))):
            texts.append(read(os.path.join(labelled, queue, name)))
            queues.append(queue)
    with open(os.path.join(args.corpus, "inbox-key.csv"), encoding="utf-8", newline="") as f:
        key = list(csv.DictReader(f))
    inbox = [read(os.path.join(args.corpus, row["path"])) for row in key]
    truth = [row["queue"] for row in key]

    vectorizer = (CountVectorizer(analyzer=cjk_bigram_terms) if args.cjk_bigrams
                  else CountVectorizer())
    model = MultinomialNB(alpha=1.0).fit(vectorizer.fit_transform(texts), queues)
    predicted = model.predict(vectorizer.transform(inbox))

    right = sum(p == t for p, t in zip(predicted, truth))
    print(f"accuracy {right / len(truth):.3f} ({right} of {len(truth)} inbox documents)")
    for queue in sorted(set(truth)):
        rows = [p for p, t in zip(predicted, truth) if t == queue]
        hits = sum(p == queue for p in rows)
        print(f"  {queue:<20} recall {hits / len(rows):.2f} ({hits} of {len(rows)})")
    for row, p, t in zip(key, predicted, truth):
        if p != t:
            print(f"  wrong: {row['path']}: {t} routed to {p}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
