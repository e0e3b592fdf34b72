#!/usr/bin/python3
"""Nothing is lost when `route --into --move` is killed (DESIGN.md,
"Non-negotiables").

    delivery_kill_test.py path/to/chute [--full] [--seed N]

Each run makes an inbox of 500 documents (five subfolders whose files share
their names, so that the -2, -3 names are used; every text unique) and
routes it with `chute route inbox --into dest --move --hold-below 0.6`
(some go to _review), killing the process with SIGKILL after a random,
seeded delay between the start-up (a run on an empty inbox) and the end of
an unkilled run (both measured first, once per kind of run). One run in
three is killed a second time while it reruns, at any moment (it may land
while the rerun finishes the deliveries the first left). The last line
counts the kills that left some documents delivered and some not, and
those that caught a document in both places.
After each kill:
  - every document's bytes (by SHA-256) are in the inbox, under its own
    path, or in exactly one file below dest, or in both; never in neither;
  - no file below dest under a real name (not chute's .chute-tmp-*
    temporary files) is truncated or anything but one of the documents;
  - every decision the log marks delivered names a file that holds it.
Then a rerun must exit 0, leave the inbox empty and no temporary file,
every document in exactly one file below dest, `chute log` must hold
exactly one delivered decision per document whose destination is where
the document is, and `chute check` must pass.

Runs alternate between three kinds: inbox and dest on one filesystem;
dest on another (/dev/shm, a tmpfs; the st_dev of the two are asserted to
differ), so that the bytes are copied; one filesystem with
CHUTE_TEST_FORCE_COPY=1 (cli/deliver/file_delivery.h), which forces the
copy path there. Every other run delivers in batches of 48 documents
instead of 512 (CHUTE_TEST_DELIVERY_BATCH), so that one batch is delivered
while the next is decided. 15 runs (make test); 100 with --full (make
soak).

Exit status 0 when every check holds; the failures are printed otherwise.
"""

import hashlib
import json
import os
import shutil
import signal
import subprocess
import sys
import tempfile
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import reliability as rl  # noqa: E402

DOCUMENTS = 500
FOLDERS = 5
KINDS = ("same-fs", "across-fs", "forced-copy")
# Every other run delivers in batches of this size instead of chute's 512
# (CHUTE_TEST_DELIVERY_BATCH), so that batches are logged, delivered and
# decided side by side when the kill lands.
SMALL_BATCH = 48
SHM = "/dev/shm"

checks = rl.Checks()
expect = checks.expect


def sha256(data):
    return hashlib.sha256(data).hexdigest()


def write_inbox(inbox, rng, serial0):
    """DOCUMENTS files in FOLDERS subfolders, names repeating across them;
    returns {relative path: digest}."""
    made = {}
    per = DOCUMENTS // FOLDERS
    for f in range(FOLDERS):
        folder = os.path.join(inbox, "batch%d" % f)
        os.makedirs(folder)
        for i in range(per):
            queue = rng.choice(rl.QUEUES)
            text = rl.make_text(rng, queue, rng.randint(30, 400))
            data = ("%s s%d\n" % (text, serial0 + f * per + i)).encode()
            rel = os.path.join("batch%d" % f, "%04d.txt" % i)
            with open(os.path.join(inbox, rel), "wb") as out:
                out.write(data)
            made[rel] = sha256(data)
    return made


def files_below(root):
    """{path: bytes} of every file below root (not following links)."""
    found = {}
    for dirpath, _, names in os.walk(root):
        for name in names:
            p = os.path.join(dirpath, name)
            with open(p, "rb") as f:
                found[p] = f.read()
    return found


def check_nothing_lost(what, inbox, dest, documents):
    """The invariant after a kill: each document in the inbox or one
    destination file, or both; nothing truncated."""
    digests = set(documents.values())
    in_dest = {}
    for path, data in files_below(dest).items():
        if os.path.basename(path).startswith(".chute-tmp-"):
            continue  # a copy in progress, under no real name
        d = sha256(data)
        expect(d in digests, "%s: %s holds %d bytes that are no document (truncated?)" % (
            what, path, len(data)))
        in_dest.setdefault(d, []).append(path)
    for rel, digest in sorted(documents.items()):
        src = os.path.join(inbox, rel)
        in_inbox = False
        if os.path.exists(src):
            with open(src, "rb") as f:
                in_inbox = sha256(f.read()) == digest
            expect(in_inbox, "%s: inbox file %s changed" % (what, rel))
        places = in_dest.get(digest, [])
        expect(len(places) <= 1, "%s: %s is in %d destination files: %s" % (
            what, rel, len(places), places))
        expect(in_inbox or places, "%s: %s is in neither the inbox nor dest: lost" % (what, rel))
    return in_dest


class Runner:
    def __init__(self, chute, work):
        self.chute = chute
        self.work = work
        self.small_batches = False

    def env(self, kind):
        env = rl.Chute(self.chute.binary, self.work).env()
        env.pop("CHUTE_TEST_FORCE_COPY", None)
        env.pop("CHUTE_TEST_DELIVERY_BATCH", None)
        if kind == "forced-copy":
            env["CHUTE_TEST_FORCE_COPY"] = "1"
        if self.small_batches:
            env["CHUTE_TEST_DELIVERY_BATCH"] = str(SMALL_BATCH)
        return env

    def args(self, db, inbox, dest):
        return [self.chute.binary, "route", "--db", db, inbox, "--into", dest, "--move",
                "--hold-below", "0.6", "--format", "jsonl", "--threads", "2"]

    def run(self, kind, db, inbox, dest):
        return subprocess.run(self.args(db, inbox, dest), cwd=self.work, env=self.env(kind),
                              capture_output=True, text=True)

    def killed(self, kind, db, inbox, dest, delay):
        p = subprocess.Popen(self.args(db, inbox, dest), cwd=self.work, env=self.env(kind),
                             stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
        time.sleep(delay)
        p.send_signal(signal.SIGKILL)
        _, err = p.communicate()
        return p.returncode, err.decode(errors="replace")


def places_for(kind, work, run):
    """(inbox, dest) for one run of a kind, made empty."""
    inbox = os.path.join(work, "r%03d" % run, "inbox")
    if kind == "across-fs":
        dest = tempfile.mkdtemp(prefix="chute-kill-dest-", dir=SHM)
    else:
        dest = os.path.join(work, "r%03d" % run, "dest")
        os.makedirs(dest)
    os.makedirs(inbox)
    if kind == "across-fs":
        expect(os.stat(inbox).st_dev != os.stat(dest).st_dev,
               "across-fs: %s and %s are on one filesystem" % (inbox, dest))
    return inbox, dest


def check_logged_where_they_are(what, chute, db):
    """A decision is marked delivered only once its file is in place."""
    for r in log_rows(chute, db):
        try:
            with open(r["destination"], "rb") as f:
                ok = sha256(f.read()) == r["digest"]
        except OSError:
            ok = False
        expect(ok, "%s: the log says %s was delivered to %s, which does not hold it" % (
            what, r["source"], r["destination"]))


def log_rows(chute, db):
    p = chute.run("log", "--format", "jsonl", db=db)
    return [json.loads(line) for line in p.stdout.splitlines()]


def one_run(runner, kind, run, rng, expected, landed):
    chute = runner.chute
    db = "r%03d.db" % run
    chute.copy_store(db)
    inbox, dest = places_for(kind, runner.work, run)
    try:
        documents = write_inbox(inbox, rng, run * DOCUMENTS)
        kills = 2 if rng.random() < 1 / 3 else 1
        startup, whole = expected
        for k in range(kills):
            # The first kill lands after the start-up (reading the model),
            # while documents are decided and delivered; a second one
            # anywhere, so also while the rerun finishes what the first
            # left.
            delay = rng.uniform(startup if k == 0 else 0.0, whole)
            code, err = runner.killed(kind, db, inbox, dest, delay)
            what = "run %d (%s), kill %d after %.3f s" % (run, kind, k + 1, delay)
            if code == -signal.SIGKILL:
                landed["killed"] += 1
            else:
                landed["finished first"] += 1
                expect(code == 0, "%s: exit %d: %s" % (what, code, err))
            in_dest = check_nothing_lost(what, inbox, dest, documents)
            in_inbox = sum(os.path.exists(os.path.join(inbox, rel)) for rel in documents)
            if 0 < len(in_dest) < len(documents):
                landed["mid-delivery"] += 1
            if len(in_dest) + in_inbox > len(documents):
                landed["both places"] += 1
            check_logged_where_they_are(what, chute, db)
        what = "run %d (%s), the rerun" % (run, kind)
        p = runner.run(kind, db, inbox, dest)
        expect(p.returncode == 0, "%s: exit %d: %s" % (what, p.returncode, p.stderr))
        in_dest = check_nothing_lost(what, inbox, dest, documents)
        temporary = [p for p in files_below(dest) if os.path.basename(p).startswith(".chute-tmp-")]
        expect(not temporary, "%s: temporary files left: %s" % (what, temporary[:3]))
        left = [rel for rel in documents if os.path.exists(os.path.join(inbox, rel))]
        expect(not left, "%s: %d documents left in the inbox, such as %s" % (
            what, len(left), left[:3]))
        for rel, digest in documents.items():
            expect(len(in_dest.get(digest, [])) == 1, "%s: %s is in %d destination files" % (
                what, rel, len(in_dest.get(digest, []))))
        rows = log_rows(chute, db)
        by_digest = {}
        for r in rows:
            by_digest.setdefault(r["digest"], []).append(r)
        expect(len(rows) == len(documents), "%s: the log has %d delivered rows for %d documents"
               % (what, len(rows), len(documents)))
        for rel, digest in documents.items():
            got = by_digest.get(digest, [])
            expect(len(got) == 1, "%s: %s has %d delivered rows in the log" % (
                what, rel, len(got)))
            if len(got) == 1 and in_dest.get(digest):
                expect(got[0]["destination"] == in_dest[digest][0],
                       "%s: %s logged at %s but is at %s" % (
                           what, rel, got[0]["destination"], in_dest[digest][0]))
                expect(got[0]["source"] == os.path.join(inbox, rel),
                       "%s: %s logged from %s" % (what, rel, got[0]["source"]))
        c = chute.run("check", db=db, check=False)
        expect(c.returncode == 0, "%s: chute check exit %d: %s%s" % (
            what, c.returncode, c.stdout, c.stderr))
    finally:
        shutil.rmtree(os.path.dirname(inbox), ignore_errors=True)
        if kind == "across-fs":
            shutil.rmtree(dest, ignore_errors=True)
        for suffix in ("", "-wal", "-shm"):
            if os.path.exists(os.path.join(runner.work, db + suffix)):
                os.remove(os.path.join(runner.work, db + suffix))


def measure(runner, kind, rng):
    """(start-up, whole): seconds a run of the kind takes on an empty inbox
    and on a full one, unkilled (the full one is also checked)."""
    db = "measure.db"
    runner.chute.copy_store(db)
    inbox, dest = places_for(kind, runner.work, 999)
    try:
        t = time.monotonic()
        p = runner.run(kind, db, inbox, dest)
        startup = time.monotonic() - t
        expect(p.returncode == 0, "measure %s, empty: exit %d: %s" % (
            kind, p.returncode, p.stderr))
        documents = write_inbox(inbox, rng, 10 ** 6)
        t = time.monotonic()
        p = runner.run(kind, db, inbox, dest)
        seconds = time.monotonic() - t
        expect(p.returncode == 0, "measure %s: exit %d: %s" % (kind, p.returncode, p.stderr))
        in_dest = check_nothing_lost("measure " + kind, inbox, dest, documents)
        expect(len(in_dest) == len(documents), "measure %s: %d of %d documents delivered" % (
            kind, len(in_dest), len(documents)))
        return startup, max(seconds, startup)
    finally:
        shutil.rmtree(os.path.dirname(inbox), ignore_errors=True)
        if kind == "across-fs":
            shutil.rmtree(dest, ignore_errors=True)


def main():
    a = rl.parse_arguments(20261202, "100 runs instead of 15 (make soak)")
    runs = 100 if a.full else 15
    expect(os.path.isdir(SHM), SHM + " is missing: the across-filesystem runs need a tmpfs")
    with tempfile.TemporaryDirectory(prefix="chute-kill-") as work:
        rng = rl.rng_for(a.seed)
        chute = rl.Chute(a.chute, work)
        rl.write_corpus(os.path.join(work, "labelled"), rng, 25)
        chute.run("init")
        chute.run("learn", "--tree", "labelled")
        runner = Runner(chute, work)
        expected = {kind: measure(runner, kind, rng) for kind in KINDS}
        landed = {"killed": 0, "finished first": 0, "mid-delivery": 0, "both places": 0}
        for run in range(runs):
            kind = KINDS[run % len(KINDS)]
            runner.small_batches = run % 2 == 1
            one_run(runner, kind, run, rng, expected[kind], landed)
        timing = ", ".join("%s %.2f s (start-up %.2f s)" % (k, v[1], v[0])
                           for k, v in expected.items())
    return checks.exit_status(
        "%d runs of %d documents (unkilled: %s): %d kills landed (%d with some documents "
        "delivered and some not, %d with a document in both places), %d runs finished before "
        "their kill; nothing lost, no duplicates, one log row per document" % (
            runs, DOCUMENTS, timing, landed["killed"], landed["mid-delivery"],
            landed["both places"], landed["finished first"]))


if __name__ == "__main__":
    sys.exit(main())
