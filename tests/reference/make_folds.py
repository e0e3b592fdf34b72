#!/usr/bin/python3
"""Makes the committed 5-fold assignments of the two outside corpora.

    tests/reference/make_folds.py            # writes folds/reuters.csv and
                                             # folds/manpages.csv beside it

Stratified: within each queue the documents, sorted by path, are shuffled
with a seeded generator and dealt round-robin to folds 1..5, each queue
starting where the previous one stopped, so every fold holds about a fifth
of every queue and the folds differ in size by at most one document. The
same packages and seed always give the same files (see folds/README.md).
"""

import csv
import os
import random
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import corpora  # noqa: E402

SEED = 21578
FOLDS = 5


def assign_folds(docs, seed):
    """[(path, queue)] -> [(path, queue, fold)] sorted by path."""
    rng = random.Random(seed)
    by_queue = {}
    for path, queue in docs:
        by_queue.setdefault(queue, []).append(path)
    rows, start = [], 0
    for queue in sorted(by_queue):
        paths = sorted(by_queue[queue])
        rng.shuffle(paths)
        for i, path in enumerate(paths):
            rows.append((path, queue, (start + i) % FOLDS + 1))
        start += len(paths)
    return sorted(rows)


def write(name, rows):
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "folds",
                        name)
    os.makedirs(os.path.dirname(path), exist_ok=True)
    with open(path, "w", newline="", encoding="utf-8") as f:
        out = csv.writer(f, lineterminator="\n")
        out.writerow(["path", "queue", "fold"])
        out.writerows(rows)
    queues = sorted({q for _, q, _ in rows})
    counts = ", ".join(f"{q} {sum(1 for _, r, _ in rows if r == q)}"
                       for q in queues)
    print(f"{path}: {len(rows)} documents ({counts})")


def main():
    write("reuters.csv", assign_folds(corpora.list_reuters(), SEED))
    write("manpages.csv", assign_folds(corpora.list_manpages(), SEED))


if __name__ == "__main__":
    main()
