#!/usr/bin/python3
"""chute watch against a batch route of the same files (make bench).

    tests/bench/watch_vs_route.py BUILD_DIR

Goal (issue 5): `chute watch` keeps at least half the throughput of a batch
`chute route --into --move` of the same files.

What is measured, and how:
- The corpus of tests/bench/make_corpus.py in BUILD_DIR/bench/corpus (the
  one run.sh makes; BENCH_MEGABYTES, default 100, as there):
  train/ is learned once into a store (not timed); the documents of test/
  are the files routed, copied flat into an inbox before each run (not
  timed; the copies are read once, so both runs read from the page cache).
- Each run starts from a fresh copy of the learned store (not timed), so
  both find the same model and an empty decision log.
- batch: `chute route inbox --into dest --move --format jsonl` under GNU
  time: the wall seconds of the whole process (start-up included).
- watch: `chute watch inbox --into dest --move --format jsonl` is started
  on an empty inbox and waited for (its "watching" line); then the files
  arrive as a burst, each renamed into the inbox from a folder beside it
  on the same filesystem (as a producer that writes elsewhere and moves
  in); timed from the first rename to the moment the last decision line
  is on its standard output (polled every 20 ms). Its start-up is not in
  the figure (a watch starts once); the batch's is.
- BENCH_WATCH_PAIRS pairs (default 3), batch then watch; medians. Both
  must decide every document, and the same queue for each (same model).
- Reported: documents, MB (10^6 bytes), median seconds, documents a
  second, and the ratio watch throughput / batch throughput; with the
  1-minute load average, since other work on the machine skews every
  figure. Results also in BUILD_DIR/bench/watch_results.json.
"""

import json
import os
import shutil
import signal
import statistics
import subprocess
import sys
import time

PY = "/usr/bin/python3"
TIMER = "/usr/bin/time"


def load():
    with open("/proc/loadavg") as f:
        return float(f.read().split()[0])


def run(cmd, **kw):
    p = subprocess.run(cmd, capture_output=True, text=True, **kw)
    if p.returncode not in (0, 3):
        sys.exit("watch_vs_route.py: %s failed (exit %d): %s"
                 % (" ".join(cmd[:3]), p.returncode, p.stderr[-500:]))
    return p


def fill(inbox, files):
    """Copies the test documents flat into inbox (names are unique)."""
    shutil.rmtree(inbox, ignore_errors=True)
    os.makedirs(inbox)
    for src in files:
        shutil.copyfile(src, os.path.join(inbox, os.path.basename(src)))


def fresh_store(work, learned):
    db = os.path.join(work, "run.db")
    for suffix in ("", "-wal", "-shm"):
        if os.path.exists(db + suffix):
            os.remove(db + suffix)
    for suffix in ("", "-wal"):  # no process holds the learned store open
        if os.path.exists(learned + suffix):
            shutil.copyfile(learned + suffix, db + suffix)
    return db


def decisions(path):
    out = {}
    with open(path) as f:
        for line in f:
            d = json.loads(line)
            out[os.path.basename(d["source"])] = d["queue"]
    return out


def batch_run(chute, work, learned, files):
    inbox, dest = os.path.join(work, "inbox"), os.path.join(work, "dest")
    fill(inbox, files)
    shutil.rmtree(dest, ignore_errors=True)
    db = fresh_store(work, learned)
    out = os.path.join(work, "batch.jsonl")
    with open(out, "w") as f:
        p = subprocess.run([TIMER, "-f", "%e", "-o", os.path.join(work, "time"), chute,
                            "route", "--db", db, inbox, "--into", dest, "--move",
                            "--format", "jsonl"], stdout=f, stderr=subprocess.PIPE, text=True)
    if p.returncode != 0:
        sys.exit("watch_vs_route.py: batch route failed (exit %d): %s"
                 % (p.returncode, p.stderr[-500:]))
    with open(os.path.join(work, "time")) as f:
        seconds = float(f.read().split()[-1])
    return seconds, decisions(out)


def count_lines(path):
    with open(path, "rb") as f:
        return f.read().count(b"\n")


def watch_run(chute, work, learned, files):
    inbox, dest = os.path.join(work, "inbox"), os.path.join(work, "dest")
    staging = os.path.join(work, "staging")
    fill(staging, files)
    shutil.rmtree(inbox, ignore_errors=True)
    os.makedirs(inbox)
    shutil.rmtree(dest, ignore_errors=True)
    db = fresh_store(work, learned)
    out = os.path.join(work, "watch.jsonl")
    err = os.path.join(work, "watch.err")
    with open(out, "w") as fo, open(err, "w") as fe:
        p = subprocess.Popen([chute, "watch", "--db", db, inbox, "--into", dest, "--move",
                              "--format", "jsonl"], stdout=fo, stderr=fe)
    try:
        end = time.monotonic() + 60
        while "watching" not in open(err).read():
            if p.poll() is not None or time.monotonic() > end:
                sys.exit("watch_vs_route.py: watch did not start: " + open(err).read())
            time.sleep(0.02)
        names = sorted(os.listdir(staging))
        t0 = time.monotonic()
        for n in names:
            os.rename(os.path.join(staging, n), os.path.join(inbox, n))
        end = time.monotonic() + 3600
        while count_lines(out) < len(names):
            if p.poll() is not None or time.monotonic() > end:
                sys.exit("watch_vs_route.py: watch ended early: " + open(err).read()[-500:])
            time.sleep(0.02)
        seconds = time.monotonic() - t0
    finally:
        p.send_signal(signal.SIGTERM)
        rc = p.wait(60)
    if rc != 0:
        sys.exit("watch_vs_route.py: watch exited %d after SIGTERM" % rc)
    return seconds, decisions(out)


def main():
    if len(sys.argv) != 2:
        sys.exit(__doc__)
    here = os.path.dirname(os.path.abspath(__file__))
    build = os.path.abspath(sys.argv[1])
    chute = os.path.join(build, "chute")
    pairs = int(os.environ.get("BENCH_WATCH_PAIRS", "3"))
    corpus = os.path.join(build, "bench", "corpus")
    work = os.path.join(build, "bench", "watch")
    # Made once; nothing is done when corpus.json says it is already there
    # with this size (and the generator's seed and version).
    run([PY, os.path.join(here, "make_corpus.py"), corpus,
         "--megabytes", os.environ.get("BENCH_MEGABYTES", "100")])
    shutil.rmtree(work, ignore_errors=True)
    os.makedirs(work)
    learned = os.path.join(work, "learned.db")
    run([chute, "init", "--db", learned])
    run([chute, "learn", "--db", learned, "--tree", os.path.join(corpus, "train")])
    files = []
    for folder, _, names in os.walk(os.path.join(corpus, "test")):
        files += [os.path.join(folder, n) for n in names if not n.startswith(".")]
    files.sort()
    megabytes = sum(os.path.getsize(f) for f in files) / 1e6
    print("watch vs batch route --into --move: %d documents, %.1f MB, %d pairs; load %.2f"
          % (len(files), megabytes, pairs, load()), flush=True)
    times = {"batch": [], "watch": []}
    for i in range(pairs):
        b, batch_queues = batch_run(chute, work, learned, files)
        w, watch_queues = watch_run(chute, work, learned, files)
        if len(batch_queues) != len(files) or watch_queues != batch_queues:
            sys.exit("watch_vs_route.py: the runs did not decide the same documents alike "
                     "(%d batch, %d watch decisions)" % (len(batch_queues), len(watch_queues)))
        times["batch"].append(b)
        times["watch"].append(w)
        print("pair %d: batch %.2f s, watch %.2f s" % (i + 1, b, w), flush=True)
    med = {k: statistics.median(v) for k, v in times.items()}
    rate = {k: len(files) / med[k] for k in med}
    ratio = rate["watch"] / rate["batch"]
    for k in ("batch", "watch"):
        print("%-5s median %7.2f s  %8.1f documents/s  %6.2f MB/s"
              % (k, med[k], rate[k], megabytes / med[k]))
    print("watch / batch throughput: %.2f (goal >= 0.5)" % ratio)
    print("load after: %.2f" % load())
    with open(os.path.join(build, "bench", "watch_results.json"), "w") as f:
        json.dump({"documents": len(files), "megabytes": megabytes, "pairs": pairs,
                   "seconds": times, "median_seconds": med, "documents_per_second": rate,
                   "ratio_watch_to_batch": ratio, "goal": 0.5, "load_after": load()},
                  f, indent=2)
    return 0


if __name__ == "__main__":
    sys.exit(main())
