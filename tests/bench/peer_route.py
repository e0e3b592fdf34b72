#!/usr/bin/python3
"""The peer of `chute route ... --format jsonl` in the speed benchmark
(tests/bench/run.sh).

    tests/bench/peer_route.py MODEL_PICKLE PATH...

Loads the CountVectorizer and MultinomialNB pickled by peer_learn.py, reads
the documents (files, and folders walked recursively in byte order of their
paths, skipping names that begin with '.', as chute does), and prints one
JSON object per document on standard output:
    {"file": "<path>", "queue": "<winner>", "confidence": <its posterior>}
"""

import json
import os
import pickle
import sys


def walk(path):
    if not os.path.isdir(path):
        yield path
        return
    found = []
    for root, dirs, files in os.walk(path):
        dirs[:] = [d for d in dirs if not d.startswith(".")]
        found.extend(os.path.join(root, f) for f in files
                     if not f.startswith("."))
    yield from sorted(found, key=os.fsencode)


def main():
    if len(sys.argv) < 3:
        sys.exit("usage: peer_route.py MODEL_PICKLE PATH...")
    with open(sys.argv[1], "rb") as f:
        vectorizer, model = pickle.load(f)
    paths = [p for arg in sys.argv[2:] for p in walk(arg)]
    counts = vectorizer.transform(paths)
    posteriors = model.predict_proba(counts)
    best = posteriors.argmax(axis=1)
    out = sys.stdout
    for path, b, row in zip(paths, best, posteriors):
        out.write(json.dumps({"file": path,
                              "queue": str(model.classes_[b]),
                              "confidence": float(row[b])},
                             ensure_ascii=False))
        out.write("\n")


if __name__ == "__main__":
    main()
