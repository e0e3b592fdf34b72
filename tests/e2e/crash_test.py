#!/usr/bin/python3
"""Crash safety of learn, correct (from a file and from the folders), forget
and rollback, end to end.

    crash_test.py path/to/chute [--full] [--seed N]

1. Fault points (store/fault_point.h): each command runs with
   CHUTE_TEST_FAULT naming one of its points and must stop there with exit
   86. Then `chute check` must pass and the current fingerprint must be the
   one before the change (a point before the commit) or the one a copy of
   the store reaches by running the same command without a fault (a point
   after the commit). After forget.before_checkpoint, once the next command
   has opened and closed the store, the forgotten document's planted word
   must be in none of the store's files.
2. Random SIGKILLs: a seeded sequence of learn, correct, forget and rollback
   runs on a generated corpus, each killed after a random delay within its expected
   duration (measured by running it first on a copy of the store). After
   each kill `chute check` passes and the fingerprint equals the one before
   or the one after the change. 10 runs, 50 with --full (make soak). The
   last line counts where the kills landed: before the commit, while it was
   writing (the model is the one before and the write-ahead log holds the
   killed process's frames), after it, or after the process had finished.

Exit status 0 when every check holds; the failures are printed otherwise.
"""

import hashlib
import os
import signal
import sqlite3
import sys
import tempfile
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import reliability as rl  # noqa: E402

FAULT_EXIT = 86  # kFaultExitCode in store/fault_point.h

checks = rl.Checks()
expect = checks.expect


def check_passes(chute, what):
    p = chute.run("check", check=False)
    expect(p.returncode == 0, "%s: chute check exit %d: %s%s" % (
        what, p.returncode, p.stdout, p.stderr))


def seed_review_log(tmp, rng):
    """Documents a reviewer moved: each logged as delivered into one queue's
    folder of routed/ (the decisions table written with SQL, as route --into
    writes it) and lying in another queue's folder, for correct
    --from-folders."""
    docs = rl.write_corpus(os.path.join(tmp, "l2"), rng, 2, prefix="r")
    routed = os.path.realpath(os.path.join(tmp, "routed"))
    con = sqlite3.connect(os.path.join(tmp, "s.db"))
    with con:
        for path, queue in docs:
            chosen = rl.QUEUES[(rl.QUEUES.index(queue) + 1) % len(rl.QUEUES)]
            name = os.path.basename(path)
            with open(os.path.join(tmp, path), "rb") as f:
                data = f.read()
            os.makedirs(os.path.join(routed, queue), exist_ok=True)
            with open(os.path.join(routed, queue, name), "wb") as f:
                f.write(data)
            con.execute(
                "INSERT INTO decisions (digest, source, destination, queue, confidence, "
                "model_version, time, by, mode, delivered, terms) "
                "VALUES (?, ?, ?, ?, 0.9, 1, '2026-12-01T00:00:00Z', 'seed', 'move', 1, 10)",
                (hashlib.sha256(data).hexdigest(), os.path.join(tmp, path),
                 os.path.join(routed, chosen, name), chosen))
    con.close()


def fault_points(binary, seed):
    """Each fault point once, on a small store."""
    with tempfile.TemporaryDirectory(prefix="chute-fault-") as tmp:
        rng = rl.rng_for(seed)
        chute = rl.Chute(binary, tmp)
        first = rl.write_corpus(os.path.join(tmp, "l0"), rng, 15)
        later = rl.write_corpus(os.path.join(tmp, "l1"), rng, 10, prefix="e")
        planted = "zqxplanted%d" % seed
        with open(os.path.join(tmp, "l0", "billing", "planted.txt"), "w") as f:
            f.write("invoice query from %s about harbour dues\n" % planted)
        chute.run("init")
        chute.run("learn", "--tree", "l0")

        def case(point, command, *args, after_commit=False, then=None):
            before = chute.fingerprint()
            versions_before = len(chute.versions())
            # The same change on a copy, without a fault: the fingerprint
            # after it.
            ref_db = chute.copy_store("reference.db")
            chute.run(command, *args, db=ref_db)
            after = chute.fingerprint(ref_db)
            expect(after != before, "%s: the change must change the model" % point)
            p = chute.run(command, *args, fault=point, check=False)
            expect(p.returncode == FAULT_EXIT, "%s: exit %d, not %d: %s" % (
                point, p.returncode, FAULT_EXIT, p.stderr))
            if then:
                then()
            check_passes(chute, point)
            now = chute.fingerprint()
            want = after if after_commit else before
            expect(now == want, "%s: fingerprint %s, expected %s (%s the change)" % (
                point, now, want, "after" if after_commit else "before"))
            expect(len(chute.versions()) == versions_before + (1 if after_commit else 0),
                   "%s: %d versions, had %d" % (point, len(chute.versions()),
                                               versions_before))
            print("%s: stopped, check passed, fingerprint %s the change" % (
                point, "after" if after_commit else "before"), flush=True)
            if not after_commit:
                # The interrupted change, run again, completes.
                chute.run(command, *args)
                expect(chute.fingerprint() == after,
                       "%s: the change run again gives another model" % point)

        case("learn.before_commit", "learn", "--tree", "l1")
        rl.write_csv(os.path.join(tmp, "fixes.csv"), ("document", "queue"),
                     [(path, rl.QUEUES[(rl.QUEUES.index(q) + 1) % len(rl.QUEUES)])
                      for path, q in first[::3]])
        case("correct.before_commit", "correct", "fixes.csv")
        seed_review_log(tmp, rng)
        case("review.before_commit", "correct", "--from-folders", "routed")
        forget = [path for path, _ in later[::4]]
        case("forget.before_commit", "forget", *forget)

        case("rollback.before_commit", "rollback", "2")
        # A rebuild stopped in a batch or in the swap leaves the model as it
        # was; stopped after the swap (before its clean-up), the new one.
        case("rebuild.batch_before_commit", "rebuild", "--bigrams", "on")
        case("rebuild.swap_before_commit", "rebuild", "--numbers", "fold")
        case("rebuild.before_cleanup", "rebuild", "--min-length", "2", after_commit=True)

        store_files = [os.path.join(tmp, "s.db" + s) for s in ("", "-wal", "-shm")]

        def holds_planted():
            found = []
            for path in store_files:
                if os.path.exists(path):
                    with open(path, "rb") as f:
                        if planted.encode() in f.read():
                            found.append(os.path.basename(path))
            return found

        expect(holds_planted() != [],
               "the test must first see the planted word in the store")
        case("forget.before_checkpoint", "forget", "l0/billing/planted.txt",
             after_commit=True)
        # The next command to open the store (check, in case()) recovered
        # and checkpointed it: the forgotten text must be gone everywhere.
        expect(holds_planted() == [],
               "forget.before_checkpoint: the planted word is still in %s after "
               "the next command closed the store" % holds_planted())


def init_fault(binary):
    """A crash inside init leaves no store (a stray temporary file at most),
    never a store without settings: init then simply runs again."""
    with tempfile.TemporaryDirectory(prefix="chute-init-") as tmp:
        chute = rl.Chute(binary, tmp)
        p = chute.run("init", fault="init.before_name", check=False)
        expect(p.returncode == FAULT_EXIT, "init.before_name: exit %d: %s" % (
            p.returncode, p.stderr))
        expect(not os.path.exists(os.path.join(tmp, "s.db")),
               "init.before_name: the store exists before init finished")
        chute.run("init")
        check_passes(chute, "init.before_name")
        expect(len(chute.versions()) == 1, "init after a crash: one version")
        print("init.before_name: stopped, no store left; init ran again", flush=True)


def random_kills(binary, seed, runs):
    with tempfile.TemporaryDirectory(prefix="chute-kill-") as tmp:
        rng = rl.rng_for(seed)
        chute = rl.Chute(binary, tmp)
        pool = rl.write_corpus(os.path.join(tmp, "pool"), rng, 150, words=(40, 400))
        chute.run("init")
        rl.write_csv(os.path.join(tmp, "start.csv"), ("path", "queue"),
                     [(p, q) for p, q in pool[::2]])
        chute.run("learn", "--csv", "start.csv")
        landed = {"before": 0, "midway": 0, "after": 0, "finished": 0}
        wal = os.path.join(tmp, "s.db-wal")
        for run in range(runs):
            op = rng.choice(("learn", "correct", "forget", "rollback"))
            sample = rng.sample(pool, rng.randint(20, 120))
            if op == "learn":
                rl.write_csv(os.path.join(tmp, "batch.csv"), ("path", "queue"), sample)
                args = ("--csv", "batch.csv")
            elif op == "correct":
                rl.write_csv(os.path.join(tmp, "batch.csv"), ("document", "queue"),
                             [(p, rng.choice(rl.QUEUES)) for p, _ in sample])
                args = ("batch.csv",)
            elif op == "forget":
                args = tuple(p for p, _ in sample[:rng.randint(1, 15)])
            else:
                args = (str(rng.choice(chute.versions())[0]),)
            before = chute.fingerprint()
            ref_db = chute.copy_store("reference.db")
            started = time.monotonic()
            chute.run(op, *args, db=ref_db, check=False)
            duration = time.monotonic() - started
            after = chute.fingerprint(ref_db)
            delay = rng.uniform(0.2, 1.1) * duration
            proc = chute.popen(op, *args)
            time.sleep(delay)
            finished = proc.poll() is not None
            if not finished:
                proc.send_signal(signal.SIGKILL)
            proc.communicate()
            # The last command closed the store and emptied its write-ahead
            # log; frames in it now were written by the killed process.
            wrote = os.path.exists(wal) and os.path.getsize(wal) > 0
            what = "run %d (%s, %d names, kill after %.0f of %.0f ms)" % (
                run, op, len(sample), delay * 1e3, duration * 1e3)
            check_passes(chute, what)
            now = chute.fingerprint()
            if finished:
                landed["finished"] += 1
                expect(now == after, what + ": finished, yet not the model after")
            elif now == after and after != before:
                landed["after"] += 1
            elif now == before:
                # With frames in the log, the kill cut the commit's writes.
                landed["midway" if wrote else "before"] += 1
            else:
                expect(False, what + ": fingerprint %s is neither before (%s) nor "
                       "after (%s)" % (now, before, after))
        print("random kills: %d runs; killed before the commit %d, while it "
              "was writing %d, after it %d, finished before the kill %d" % (
                  runs, landed["before"], landed["midway"], landed["after"],
                  landed["finished"]), flush=True)


def main():
    a = rl.parse_arguments(4086, "the soak counts (50 random kills, not 10)")
    fault_points(a.chute, a.seed)
    init_fault(a.chute)
    random_kills(a.chute, a.seed + 1, 50 if a.full else 10)
    return checks.exit_status("all crash-safety checks held")


if __name__ == "__main__":
    sys.exit(main())
