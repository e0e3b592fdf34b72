#!/usr/bin/python3
"""Routing while the model changes, end to end.

    concurrency_test.py path/to/chute [--full] [--seed N]

Four processes loop `chute route inbox --format jsonl` over a folder while
two writers change the model: one applies corrections (`chute correct`,
two files that move the same documents back and forth, in turn), the other
learns batches of new documents (`chute learn --csv`), and a third
rebuilds the model over and over (`chute rebuild`, switching bigrams on
and off, so every document is recounted from its kept text and swapped in,
and the smoothing between 1 and 0.5); a fifth process loops `chute check`. Asserted:
- no process fails: every exit status is 0 and no standard error mentions
  a locked or busy database (nothing is printed on it at all); every check
  passes while the writers write;
- every decision carries a `model_version` and a `fingerprint`, the
  fingerprint is the one `chute versions` lists for that version, and one
  run of route decides all its documents with one version;
- `chute route inbox --at-version V --format jsonl` gives, for every file,
  the same queue and the same posteriors (to the last digit) as the
  decisions made with V while the writers were running;
- the routers saw more than one version (the test must overlap them).
Counts: 12 corrections, 12 learns of 8 documents and at least 6 routing
runs per router; with --full (make soak) 120 corrections, 120 learns and
at least 40 runs per router.
"""

import json
import os
import subprocess
import sys
import tempfile
import threading

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import reliability as rl  # noqa: E402

ROUTERS = 4
NEW_PER_BATCH = 8  # documents per learn of the second writer

checks = rl.Checks()
expect = checks.expect


def decision(row):
    """What must be equal between a decision and its replay."""
    return (row["queue"], row["confidence"],
            [(t["queue"], t["posterior"], t["log_posterior"]) for t in row["top"]])


def main():
    a = rl.parse_arguments(4087, "the soak counts (120 corrections, not 12)")
    corrections, min_runs = (120, 40) if a.full else (12, 6)
    binary = a.chute
    with tempfile.TemporaryDirectory(prefix="chute-concurrency-") as tmp:
        rng = rl.rng_for(a.seed)
        chute = rl.Chute(binary, tmp)
        learned = rl.write_corpus(os.path.join(tmp, "l"), rng, 60)
        rl.write_corpus(os.path.join(tmp, "inbox"), rng, 8, prefix="n")
        chute.run("init")
        chute.run("learn", "--tree", "l")
        moved = rng.sample(learned, 40)
        rl.write_csv(os.path.join(tmp, "there.csv"), ("document", "queue"),
                     [(p, rl.QUEUES[(rl.QUEUES.index(q) + 1) % len(rl.QUEUES)])
                      for p, q in moved])
        rl.write_csv(os.path.join(tmp, "back.csv"), ("document", "queue"), moved)

        # A second writer: batches of new documents, learned meanwhile.
        extra = rl.write_corpus(os.path.join(tmp, "extra"), rng,
                                corrections * NEW_PER_BATCH // len(rl.QUEUES),
                                prefix="x")
        rng.shuffle(extra)
        for k in range(corrections):
            rl.write_csv(os.path.join(tmp, "batch%d.csv" % k), ("path", "queue"),
                         extra[k * NEW_PER_BATCH:(k + 1) * NEW_PER_BATCH])

        writers_done = threading.Event()
        results = [[] for _ in range(ROUTERS)]  # per router: CompletedProcess

        def router(i):
            while not writers_done.is_set() or len(results[i]) < min_runs:
                results[i].append(subprocess.run(
                    chute.args("route", "inbox", "--format", "jsonl", "--top", "4"),
                    cwd=tmp, env=chute.env(), capture_output=True, text=True))

        writer_runs = []

        retried = []

        def writer(command_of, count=corrections):
            for k in range(count):
                for attempt in range(5):
                    p = chute.run(*command_of(k), check=False)
                    # A learn whose documents were tokenized before a rebuild
                    # changed the tokenizer is refused whole (nothing mixed
                    # in) and asks to be run again: that is the contract.
                    if p.returncode == 1 and "a rebuild changed the tokenizer settings" in p.stderr:
                        retried.append(p)
                        continue
                    break
                writer_runs.append(p)

        def rebuilder(k):
            return ("rebuild", "--bigrams", "on" if k % 2 == 0 else "off",
                    "--alpha", "0.5" if k % 4 < 2 else "1", "--by", "concurrency-test")

        def corrector(k):
            return ("correct", "there.csv" if k % 2 == 0 else "back.csv",
                    "--by", "concurrency-test")

        def learner(k):
            return ("learn", "--csv", "batch%d.csv" % k, "--by", "concurrency-test")

        check_runs = []

        def checker():
            while not writers_done.is_set():
                check_runs.append(chute.run("check", check=False))

        routers = [threading.Thread(target=router, args=(i,)) for i in range(ROUTERS)]
        routers.append(threading.Thread(target=checker))
        rebuilds = max(4, corrections // 3)
        writers = [threading.Thread(target=writer, args=(corrector,)),
                   threading.Thread(target=writer, args=(learner,)),
                   threading.Thread(target=writer, args=(rebuilder, rebuilds))]
        for t in routers + writers:
            t.start()
        for t in writers:
            t.join()
        writers_done.set()
        for t in routers:
            t.join()

        for p in writer_runs + check_runs:
            expect(p.returncode == 0 and p.stderr == "",
                   "%s: exit %d: %s" % (" ".join(p.args[1:]), p.returncode, p.stderr))
        versions = dict(chute.versions())
        by_version = {}  # version -> {file: decision}
        runs = 0
        for i, router_runs in enumerate(results):
            for p in router_runs:
                runs += 1
                expect(p.returncode == 0 and p.stderr == "",
                       "router %d: route exit %d: %s" % (i, p.returncode, p.stderr))
                if p.returncode != 0:
                    continue
                rows = [json.loads(line) for line in p.stdout.splitlines()]
                expect(len(rows) == 32, "router %d: %d decisions, not 32" % (i, len(rows)))
                seen = {(r.get("model_version"), r.get("fingerprint")) for r in rows}
                expect(len(seen) == 1,
                       "router %d: one run used several versions: %s" % (i, seen))
                for r in rows:
                    v, fp = r.get("model_version"), r.get("fingerprint")
                    if v not in versions or versions[v] != fp:
                        expect(False, "router %d: %s decided with version %s, "
                               "fingerprint %s, which chute versions does not list"
                               % (i, r["file"], v, fp))
                        continue
                    seen_before = by_version.setdefault(v, {}).setdefault(
                        r["file"], decision(r))
                    expect(seen_before == decision(r),
                           "%s: two decisions with version %s differ" % (r["file"], v))
        expect(len(by_version) > 1,
               "the routers saw only versions %s; the test did not overlap "
               "routing and learning" % sorted(by_version))
        replayed = 0
        for v, decided in sorted(by_version.items()):
            p = chute.run("route", "inbox", "--at-version", str(v), "--format",
                          "jsonl", "--top", "4", check=False)
            expect(p.returncode == 0, "route --at-version %d: exit %d: %s" % (
                v, p.returncode, p.stderr))
            again = {r["file"]: r for r in map(json.loads, p.stdout.splitlines())}
            for f, d in decided.items():
                replayed += 1
                expect(f in again and decision(again[f]) == d,
                       "%s: routed with version %d as %s, --at-version %d gives %s"
                       % (f, v, d, v, decision(again[f]) if f in again else None))
                expect(f not in again or again[f].get("fingerprint") == versions[v],
                       "route --at-version %d prints fingerprint %s, not %s" % (
                           v, again.get(f, {}).get("fingerprint"), versions[v]))
        print("%d routing runs by %d routers and %d checks during %d corrections, "
              "%d learns and %d rebuilds; %d versions seen, %d decisions replayed "
              "with --at-version; %d learns run again after a rebuild" % (
                  runs, ROUTERS, len(check_runs), corrections, corrections, rebuilds,
                  len(by_version), replayed, len(retried)),
              flush=True)
    return checks.exit_status("all concurrency checks held")


if __name__ == "__main__":
    sys.exit(main())
