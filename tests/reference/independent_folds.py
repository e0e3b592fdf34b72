#!/usr/bin/python3
"""chute's cross-validation folds, computed independently of its C++ code.

    independent_folds.py                      # prints the folds of the small
                                              # case in tests/classify/folds_test.cc
    independent_folds.py path/to/chute        # checks `chute evaluate` on a
                                              # generated store

chute's folds (classify/folds.h) rest on std::mt19937_64, which the C++
standard fixes exactly (ISO/IEC 14882:2020 [rand.predef]: word size 64,
state size 312, shift size 156, mask bits 31, xor mask 0xb5026f5aa96619e9,
tempering u = 29, d = 0x5555555555555555, s = 17, b = 0x71d67fffeda60000,
t = 37, c = 0xfff7eee000000000, l = 43, initialization multiplier
6364136223846793005; the 10000th output of a default-seeded engine is
9981545732273789042), on the 64-bit Mersenne Twister of T. Nishimura,
"Tables of 64-bit Mersenne Twisters", ACM TOMACS 10(4), 2000 (citation
recalled from memory). This script writes that generator out in Python,
with the reduction and shuffle that folds.h documents, so that agreement
shows that chute's folds do not depend on one compiler's library.

With a chute binary, it makes a small store, runs `chute evaluate --json`
with two seeds, and checks every document's `fold` against this script's
assignment (documents ordered by digest, labels by queue name).
"""

import hashlib
import json
import os
import subprocess
import sys
import tempfile

M64 = (1 << 64) - 1


class MT19937_64:
    N, M = 312, 156

    def __init__(self, seed):
        self.mt = [seed & M64]
        for i in range(1, self.N):
            prev = self.mt[i - 1]
            self.mt.append((6364136223846793005 * (prev ^ (prev >> 62)) + i)
                           & M64)
        self.index = self.N

    def __call__(self):
        if self.index >= self.N:
            for k in range(self.N):
                y = ((self.mt[k] & 0xFFFFFFFF80000000)
                     | (self.mt[(k + 1) % self.N] & 0x7FFFFFFF))
                v = self.mt[(k + self.M) % self.N] ^ (y >> 1)
                if y & 1:
                    v ^= 0xB5026F5AA96619E9
                self.mt[k] = v
            self.index = 0
        y = self.mt[self.index]
        self.index += 1
        y ^= (y >> 29) & 0x5555555555555555
        y ^= (y << 17) & 0x71D67FFFEDA60000
        y ^= (y << 37) & 0xFFF7EEE000000000
        y ^= y >> 43
        return y & M64


def uniform_below(g, n):
    """Rejects draws below 2^64 mod n, then reduces modulo n (folds.h)."""
    reject_below = (1 << 64) % n
    while True:
        x = g()
        if x >= reject_below:
            return x % n


def assign_folds(labels, label_count, folds, seed):
    """Durstenfeld's Fisher-Yates shuffle per label, dealt round-robin."""
    g = MT19937_64(seed)
    by_label = [[] for _ in range(label_count)]
    for i, label in enumerate(labels):
        by_label[label].append(i)
    out, position = [0] * len(labels), 0
    for items in by_label:
        for i in range(len(items) - 1, 0, -1):
            j = uniform_below(g, i + 1)
            items[i], items[j] = items[j], items[i]
        for item in items:
            out[item] = position % folds
            position += 1
    return out


def check_binary(binary):
    g = MT19937_64(5489)
    for _ in range(9999):
        g()
    assert g() == 9981545732273789042, "the Python generator is wrong"
    failures = []
    with tempfile.TemporaryDirectory(prefix="chute-folds-") as tmp:
        words = ["harbour", "berth", "invoice", "permit", "crane", "pilot",
                 "dues", "tide", "cargo", "quay", "refund", "vacancy"]
        sizes = {"alpha": 13, "beta": 7, "gamma": 4, "delta": 1}
        truth = {}
        for q, n in sizes.items():
            os.makedirs(os.path.join(tmp, "l", q))
            for i in range(n):
                text = " ".join(words[(i * 7 + j + len(q)) % len(words)]
                                for j in range(5 + i % 4)) + f" {q} n{i}\n"
                with open(os.path.join(tmp, "l", q, f"{i}.txt"), "w") as f:
                    f.write(text)
                truth[hashlib.sha256(text.encode()).hexdigest()] = q
        db = os.path.join(tmp, "s.db")
        for args in (["init", "--db", db], ["learn", "--db", db, "--tree",
                                            os.path.join(tmp, "l")]):
            subprocess.run([binary, *args], check=True, capture_output=True)
        digests = sorted(truth)
        queues = sorted(sizes)
        labels = [queues.index(truth[d]) for d in digests]
        for seed, folds in ((1, 5), (20261202, 3)):
            out = os.path.join(tmp, f"r{seed}.json")
            subprocess.run([binary, "evaluate", "--db", db, "--folds",
                            str(folds), "--seed", str(seed), "--json", out],
                           check=True, capture_output=True)
            with open(out) as f:
                report = json.load(f)
            got = {p["document"]: p["fold"] for p in report["predictions"]}
            expected = assign_folds(labels, len(queues), folds, seed)
            for d, fold in zip(digests, expected):
                if got.get(d[:12]) != fold + 1:
                    failures.append(f"seed {seed}: document {d[:12]} in fold "
                                    f"{got.get(d[:12])}, expected {fold + 1}")
    for f in failures:
        print("DIFFERS:", f)
    if failures:
        sys.exit("FAILED: chute's folds differ from the independent "
                 "implementation")
    print(f"folds of {len(truth)} documents agree for 2 seeds")


def main():
    if len(sys.argv) == 1:
        print(assign_folds([0, 1, 0, 2, 1, 0, 0, 2, 1, 0], 3, 3, 1))
    else:
        check_binary(os.path.abspath(sys.argv[1]))


if __name__ == "__main__":
    main()
