#!/usr/bin/python3
"""Makes the labelled corpus of the speed benchmark (tests/bench/run.sh).

    tests/bench/make_corpus.py OUT_DIR [--megabytes 100] [--seed N]

Writes, into OUT_DIR:
    train/<queue>/dNNNNNN.txt   80 % of the documents (every document whose
                                index within its queue is not 4 mod 5)
    test/<queue>/dNNNNNN.txt    the other 20 %
    learn.csv                   header path,queue; the train/ documents
    test.csv                    header path,queue; the test/ documents (truth)
    route.txt                   the test/ documents, one path a line
    corpus.json                 what was made, with which seed and version
All paths in the manifests are relative to OUT_DIR.

The text is synthetic and seeded (the same seed and version give the same
bytes): 8 queues in a skewed mix; each token is drawn either from a shared
list of English function words, from a shared general vocabulary, or from
the queue's own lexicon (drawn from a common pool, so lexicons overlap).
Each of the three is Zipf-distributed (Zipf, "Human Behavior and the
Principle of Least Effort", 1949; Manning, Raghavan & Schütze, Introduction
to Information Retrieval, 2008, §5.1.2). Words are pronounceable
pseudo-words built from English-like syllables, a few with diacritics; some
documents carry a paragraph of Greek or Cyrillic pseudo-words or of common
Chinese characters; sentences carry dates, amounts and reference numbers.
Document lengths are log-uniform between 0.5 and 20 KB.

If OUT_DIR/corpus.json says the corpus there was made with the same version,
seed and size, nothing is done. Standard library only.
"""

import argparse
import csv
import itertools
import json
import math
import os
import random
import shutil
import sys

VERSION = 1  # bump when the output of a given seed changes
DEFAULT_SEED = 20240611
DEFAULT_MEGABYTES = 100

# Queue names and their share of the intake (a skewed mix is the normal case:
# DESIGN.md, "The mathematics").
QUEUES = [
    ("claims", 0.30),
    ("billing", 0.20),
    ("permits", 0.14),
    ("records", 0.11),
    ("complaints", 0.09),
    ("licensing", 0.07),
    ("appeals", 0.05),
    ("inspections", 0.04),
]

# Share of a document's tokens drawn from each source: function words, the
# general vocabulary, and queue lexicons (drawn per document between the
# bounds, so that some documents say little about their queue). A share of
# the documents mixes in another queue's lexicon, so that some are routed
# wrongly, as in a real intake.
FUNCTION_SHARE = 0.45
TOPIC_SHARE_MIN, TOPIC_SHARE_MAX = 0.03, 0.12
MIXED_DOCUMENTS = 0.3
MIXED_SHARE_MIN, MIXED_SHARE_MAX = 0.2, 0.7

GENERAL_WORDS = 40_000  # shared general vocabulary
POOL_WORDS = 60_000     # pool the queue lexicons are drawn from
LEXICON_WORDS = 12_000  # per queue
MIN_BYTES, MAX_BYTES = 500, 20_000
TEST_EVERY = 5  # every 5th document of a queue is a test document

# Common English function words (common practice: any list of the most
# frequent English words starts like this).
FUNCTION_WORDS = """the of and to a in is that for it as was with be by on not
he i this are or his from at which but have an they you were her she there
been one all we their has would when if so no will more can who out up about
them some could what into than other then only its time also these two may
any new our like my after first me did should your over such because how most
those well much where through must before each same us very here back still
both under never being while last might around between own without again
against during since until upon within whether although however please thank
dear yours sincerely regards date reference number enclosed attached above
below following request office department form letter""".split()

ONSETS = ["b", "c", "d", "f", "g", "h", "j", "k", "l", "m", "n", "p", "r",
          "s", "t", "v", "w", "y", "z", "br", "cl", "cr", "dr", "fl", "fr",
          "gl", "gr", "pl", "pr", "sc", "sh", "sl", "sm", "sn", "sp", "st",
          "str", "th", "tr", "wh", "ch", "qu", ""]
NUCLEI = ["a", "e", "i", "o", "u", "a", "e", "i", "o", "u", "ai", "ea", "ee",
          "ie", "oo", "ou", "y"]
CODAS = ["", "", "", "", "", "", "n", "r", "s", "t", "l", "m", "nd", "nt",
         "rt", "st", "ck", "ng", "x"]
SUFFIXES = [""] * 12 + ["s", "s", "ed", "ing", "er", "ly", "tion", "ment",
                        "ness", "al", "able", "ive", "ity"]
# Letters with diacritics that replace a vowel in a few words.
ACCENTED = {"a": "áàâäå", "e": "éèêë", "i": "íî", "o": "óôöø", "u": "úüû",
            "c": "ç", "n": "ñ", "s": "ß"}

LATIN_TO_CYRILLIC = dict(zip("abcdefghijklmnopqrstuvwxyz",
                             "абцдефгхийклмнопярстувшхыз"))
LATIN_TO_GREEK = dict(zip("abcdefghijklmnopqrstuvwxyz",
                          "αβψδεφγηιξκλμνοπθρστυωςχυζ"))
# Frequent Chinese characters (recalled from memory; any frequency list of
# modern Chinese starts with characters like these).
CJK_CHARACTERS = ("的一是不了人我在有他这中大来上个国到说们为子和你地出道也时年得"
                  "就那要下以会可生能对去过家学自么好多天小心里后都看前开发用经"
                  "成动工还方而事作行面同现请问题办理申报告知通部门")

NAMES = ["Morrow", "Patel", "Okafor", "Nguyen", "Kowalski", "García",
         "Müller", "Lefèvre", "Andersson", "O'Neill", "Haddad", "Rossi"]


def zipf_cumulative(n, exponent=1.0):
    """Cumulative weights 1/r^s for ranks 1..n."""
    return list(itertools.accumulate(1.0 / (r ** exponent)
                                     for r in range(1, n + 1)))


class Vocabulary:
    """All the words of the corpus, made once from the seed."""

    def __init__(self, rng):
        seen = set(FUNCTION_WORDS)
        words = []
        while len(words) < GENERAL_WORDS + POOL_WORDS:
            w = self._word(rng)
            if len(w) >= 3 and w not in seen:
                seen.add(w)
                words.append(w)
        self.general = self._by_length(words[:GENERAL_WORDS], rng)
        pool = words[GENERAL_WORDS:]
        self.lexicons = [self._by_length(rng.sample(pool, LEXICON_WORDS), rng)
                         for _ in QUEUES]
        self.function_cum = zipf_cumulative(len(FUNCTION_WORDS))
        self.general_cum = zipf_cumulative(GENERAL_WORDS)
        self.lexicon_cum = zipf_cumulative(LEXICON_WORDS)

    @staticmethod
    def _by_length(words, rng):
        """Orders words roughly shortest first, so that the frequent ranks
        get the short words, as in real text (Zipf's law of abbreviation,
        Zipf 1949)."""
        return sorted(words, key=lambda w: len(w) + rng.uniform(0, 8))

    @staticmethod
    def _word(rng):
        syllables = rng.choices([1, 2, 3, 4], weights=[35, 40, 19, 6])[0]
        w = "".join(rng.choice(ONSETS) + rng.choice(NUCLEI) + rng.choice(CODAS)
                    for _ in range(syllables)) + rng.choice(SUFFIXES)
        if len(w) > 4 and rng.random() < 0.04:  # a few with diacritics
            spots = [i for i, c in enumerate(w) if c in ACCENTED]
            if spots:
                i = rng.choice(spots)
                w = w[:i] + rng.choice(ACCENTED[w[i]]) + w[i + 1:]
        return w


def number_token(rng):
    kind = rng.randrange(5)
    if kind == 0:
        return "%02d/%02d/%d" % (rng.randint(1, 28), rng.randint(1, 12),
                                 rng.randint(2015, 2025))
    if kind == 1:
        return "{:,}.{:02d}".format(rng.randint(1, 99_999), rng.randrange(100))
    if kind == 2:
        return "%s-%d-%05d" % (rng.choice(["BP", "CL", "AC", "RQ", "LIC"]),
                               rng.randint(2015, 2025), rng.randrange(100_000))
    if kind == 3:
        return "%d:%02d" % (rng.randint(6, 20), rng.choice([0, 15, 30, 45]))
    return str(rng.randint(1, 500))


def foreign_paragraph(rng, vocab):
    """A paragraph in another script: Cyrillic, Greek or Chinese."""
    kind = rng.randrange(3)
    if kind == 2:
        sentences = []
        for _ in range(rng.randint(2, 6)):
            n = rng.randint(8, 40)
            sentences.append("".join(rng.choices(CJK_CHARACTERS, k=n)) + "。")
        return "".join(sentences)
    table = LATIN_TO_CYRILLIC if kind == 0 else LATIN_TO_GREEK
    words = rng.choices(vocab.general[:5000], k=rng.randint(20, 90))
    words = ["".join(table.get(c, c) for c in w) for w in words]
    return " ".join(words).capitalize() + "."


def make_document(rng, vocab, queue, target_bytes):
    topic_share = rng.uniform(TOPIC_SHARE_MIN, TOPIC_SHARE_MAX)
    other_share = 0.0
    other = queue
    if rng.random() < MIXED_DOCUMENTS:
        other = rng.choice([q for q in range(len(QUEUES)) if q != queue])
        other_share = topic_share * rng.uniform(MIXED_SHARE_MIN,
                                                MIXED_SHARE_MAX)
        topic_share -= other_share
    general_share = 1.0 - FUNCTION_SHARE - topic_share - other_share
    # About 5.3 bytes per token with spaces and punctuation (measured on
    # this generator's output).
    n = max(20, int(target_bytes / 5.3))
    sources = rng.choices((0, 1, 2, 3), weights=(
        FUNCTION_SHARE, general_share, topic_share, other_share), k=n)
    streams = (
        iter(rng.choices(FUNCTION_WORDS, cum_weights=vocab.function_cum,
                         k=sources.count(0))),
        iter(rng.choices(vocab.general, cum_weights=vocab.general_cum,
                         k=sources.count(1))),
        iter(rng.choices(vocab.lexicons[queue], cum_weights=vocab.lexicon_cum,
                         k=sources.count(2))),
        iter(rng.choices(vocab.lexicons[other], cum_weights=vocab.lexicon_cum,
                         k=sources.count(3))),
    )
    tokens = [next(streams[s]) for s in sources]

    parts = []
    if rng.random() < 0.6:
        parts.append("Dear %s,\n\n" % rng.choice(
            ["Sir or Madam", "colleagues", "Ms " + rng.choice(NAMES),
             "Mr " + rng.choice(NAMES)]))
    i = 0
    paragraph = []
    while i < len(tokens):
        length = rng.randint(6, 28)
        sentence = tokens[i:i + length]
        i += length
        for j in range(len(sentence)):
            r = rng.random()
            if r < 0.03:
                sentence[j] = number_token(rng)
            elif r < 0.10 and j + 1 < len(sentence):
                sentence[j] += ","
        sentence[0] = sentence[0].capitalize()
        paragraph.append(" ".join(sentence) + rng.choice(".....?!"))
        if rng.random() < 0.25:
            parts.append(" ".join(paragraph) + "\n\n")
            paragraph = []
    if paragraph:
        parts.append(" ".join(paragraph) + "\n\n")
    if rng.random() < 0.06:
        parts.insert(rng.randint(0, len(parts)),
                     foreign_paragraph(rng, vocab) + "\n\n")
    if rng.random() < 0.6:
        parts.append("Yours sincerely,\n%s\n" % rng.choice(NAMES))
    return "".join(parts)


def stamp(seed, megabytes):
    return {"version": VERSION, "seed": seed, "megabytes": megabytes}


def is_current(out_dir, want):
    try:
        with open(os.path.join(out_dir, "corpus.json"), encoding="utf-8") as f:
            have = json.load(f)
    except (OSError, ValueError):
        return False
    return all(have.get(k) == v for k, v in want.items())


def generate(out_dir, seed, megabytes):
    rng = random.Random(seed)
    vocab = Vocabulary(rng)
    names = [q for q, _ in QUEUES]
    shares = [w for _, w in QUEUES]
    target_total = megabytes * 1_000_000
    log_lo, log_hi = math.log(MIN_BYTES), math.log(MAX_BYTES)

    for part in ("train", "test"):
        for q in names:
            os.makedirs(os.path.join(out_dir, part, q), exist_ok=True)

    rows = {"train": [], "test": []}
    per_queue = [0] * len(QUEUES)
    sizes = {"train": 0, "test": 0}
    total = 0
    doc = 0
    while total < target_total:
        q = rng.choices(range(len(QUEUES)), weights=shares)[0]
        target = math.exp(rng.uniform(log_lo, log_hi))
        data = make_document(rng, vocab, q, target).encode("utf-8")
        part = "test" if per_queue[q] % TEST_EVERY == TEST_EVERY - 1 else "train"
        per_queue[q] += 1
        rel = "%s/%s/d%06d.txt" % (part, names[q], doc)
        with open(os.path.join(out_dir, rel), "wb") as f:
            f.write(data)
        rows[part].append((rel, names[q]))
        sizes[part] += len(data)
        total += len(data)
        doc += 1
        if doc % 2000 == 0:
            print("make_corpus: %d documents, %.0f MB" % (doc, total / 1e6),
                  file=sys.stderr)

    for name, part in (("learn.csv", "train"), ("test.csv", "test")):
        with open(os.path.join(out_dir, name), "w", newline="",
                  encoding="utf-8") as f:
            w = csv.writer(f, lineterminator="\r\n")  # RFC 4180 line ends
            w.writerow(["path", "queue"])
            w.writerows(rows[part])
    with open(os.path.join(out_dir, "route.txt"), "w", encoding="utf-8") as f:
        f.writelines(p + "\n" for p, _ in rows["test"])

    info = stamp(seed, megabytes)
    info.update({
        "documents": doc,
        "bytes": total,
        "train": {"documents": len(rows["train"]), "bytes": sizes["train"]},
        "test": {"documents": len(rows["test"]), "bytes": sizes["test"]},
        "queues": {n: c for n, c in zip(names, per_queue)},
    })
    # Written last: a corpus cut short by an interruption has no stamp and
    # is made again.
    with open(os.path.join(out_dir, "corpus.json"), "w",
              encoding="utf-8") as f:
        json.dump(info, f, indent=2)
        f.write("\n")
    return info


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("out_dir")
    ap.add_argument("--megabytes", type=int, default=DEFAULT_MEGABYTES)
    ap.add_argument("--seed", type=int, default=DEFAULT_SEED)
    args = ap.parse_args()

    want = stamp(args.seed, args.megabytes)
    if is_current(args.out_dir, want):
        print("make_corpus: %s is current (version %d, seed %d, %d MB)" %
              (args.out_dir, VERSION, args.seed, args.megabytes),
              file=sys.stderr)
        return 0
    # Remove only what this script makes, then make it again.
    for name in ("corpus.json", "learn.csv", "test.csv", "route.txt"):
        try:
            os.remove(os.path.join(args.out_dir, name))
        except FileNotFoundError:
            pass
    for name in ("train", "test"):
        shutil.rmtree(os.path.join(args.out_dir, name), ignore_errors=True)
    os.makedirs(args.out_dir, exist_ok=True)
    info = generate(args.out_dir, args.seed, args.megabytes)
    print("make_corpus: %d documents, %d bytes (train %d, test %d) in %s" %
          (info["documents"], info["bytes"], info["train"]["documents"],
           info["test"]["documents"], args.out_dir), file=sys.stderr)
    return 0


if __name__ == "__main__":
    sys.exit(main())
