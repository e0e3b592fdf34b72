#!/usr/bin/python3
"""chute watch under a burst of files written by a concurrent process.

    watch_test.py path/to/chute [--full] [--seed N]

`chute watch inbox --into routed --move` runs while another process (this
script started again with --produce) writes a burst of files into the
inbox the ways producers do: some in one write, some slowly in several
writes with pauses, some written in a folder beside the inbox and moved
in, some written under a dot name in the inbox and renamed at the end;
and a few dot files that are never renamed. While the burst is routed, a
learn changes the model. Asserted:
- every document is routed exactly once: one decision line per document
  on stdout, one delivered row per document in `chute log`, and one file
  in the destination per document, whose bytes equal what the producer
  wrote; the digest of each decision is the SHA-256 of the whole document
  (none was read half-written);
- the dot files are left in the inbox untouched; nothing else is left
  there, and no temporary file in the destination;
- the learn made while watching is picked up without a restart: decisions
  name the new model_version after it, and stderr says so;
- SIGTERM while a second burst is routed: exit status 0 within a few
  seconds, and every document of that burst is either still in the inbox
  or in exactly one destination, with its whole bytes (never both, never
  neither); the next watch finds no delivery left unfinished and routes
  the rest, and the log then has one row per document of both bursts;
- with --copy --recursive, files already there at the start and files in
  folders made while watching are routed; a restart skips what was
  delivered and routes a file written again;
- with --link, rescans after the links do not hand the files out again;
- usage errors exit 2, a missing inbox 1; --format csv starts with the
  log's header; SIGINT stops like SIGTERM.
Counts: 2,000 files in the first burst, 400 in the second; with --full
(make soak) 10,000 and 2,000.
"""

import hashlib
import json
import os
import random
import signal
import subprocess
import sys
import tempfile
import threading
import time

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import reliability as rl  # noqa: E402

checks = rl.Checks()
expect = checks.expect

DOT_FILES = 12  # dot files per burst that are never renamed


def document(seed, i):
    """The bytes of document i of a burst: deterministic from (seed, i),
    with a serial so that no two share a digest; sizes from 100 bytes to
    about 20 kB, so that slow writes take several pieces."""
    rng = random.Random(seed * 1_000_003 + i)
    queue = rl.QUEUES[rng.randrange(len(rl.QUEUES))]
    words = rng.choice((20, 60, 200, 600, 2500))
    return ("%s serial%d-%d\n" % (rl.make_text(rng, queue, words), seed, i)).encode()


def name_of(prefix, i):
    return "%s%05d.txt" % (prefix, i)


def produce(inbox, staging, seed, count, prefix):
    """Writes the burst (the --produce mode, in its own process)."""
    rng = random.Random(seed)
    for i in range(count):
        data = document(seed, i)
        name = name_of(prefix, i)
        kind = rng.random()
        if kind < 0.45:  # one write
            with open(os.path.join(inbox, name), "wb") as f:
                f.write(data)
        elif kind < 0.65:  # slowly, in several writes with pauses
            with open(os.path.join(inbox, name), "wb") as f:
                pieces = rng.randint(2, 5)
                step = max(1, len(data) // pieces)
                for at in range(0, len(data), step):
                    f.write(data[at:at + step])
                    f.flush()
                    if rng.random() < 0.3:
                        time.sleep(rng.choice((0.001, 0.004)))
        elif kind < 0.85:  # written elsewhere on the filesystem, moved in
            tmp = os.path.join(staging, name)
            with open(tmp, "wb") as f:
                f.write(data)
            os.rename(tmp, os.path.join(inbox, name))
        else:  # written under a dot name in the inbox, renamed at the end
            tmp = os.path.join(inbox, "." + name + ".part")
            with open(tmp, "wb") as f:
                f.write(data[: len(data) // 2])
                f.flush()
                if rng.random() < 0.2:
                    time.sleep(0.002)
                f.write(data[len(data) // 2:])
            os.rename(tmp, os.path.join(inbox, name))
        if i % (count // DOT_FILES) == 0:
            with open(os.path.join(inbox, ".%s-keep-%05d" % (prefix, i)), "wb") as f:
                f.write(b"never renamed " + data[:50])


def start_producer(binary, inbox, staging, seed, count, prefix):
    return subprocess.Popen([sys.executable, os.path.abspath(__file__), binary, "--produce",
                             inbox, staging, str(seed), str(count), prefix])


class Watch:
    """A running `chute watch`; its stdout and stderr are read by threads."""

    def __init__(self, chute, *args):
        self.p = chute.popen("watch", *args)
        self.decisions = []
        self.stderr = []
        self.lock = threading.Lock()
        self.readers = [threading.Thread(target=self._out, daemon=True),
                        threading.Thread(target=self._err, daemon=True)]
        for t in self.readers:
            t.start()

    def _out(self):
        for line in self.p.stdout:
            row = json.loads(line)
            with self.lock:
                self.decisions.append(row)

    def _err(self):
        for line in self.p.stderr:
            with self.lock:
                self.stderr.append(line.rstrip("\n"))

    def count(self):
        with self.lock:
            return len(self.decisions)

    def wait_for(self, what, timeout):
        end = time.monotonic() + timeout
        while time.monotonic() < end:
            if what():
                return True
            if self.p.poll() is not None:
                return what()
            time.sleep(0.05)
        return False

    def stop(self, timeout=20):
        """SIGTERM; returns (exit status, seconds until it ended)."""
        t0 = time.monotonic()
        self.p.send_signal(signal.SIGTERM)
        try:
            rc = self.p.wait(timeout)
        except subprocess.TimeoutExpired:
            self.p.kill()
            rc = self.p.wait()
        seconds = time.monotonic() - t0
        for t in self.readers:
            t.join(10)
        return rc, seconds


def sha(data):
    return hashlib.sha256(data).hexdigest()


def check_burst(tmp, seed, count, prefix, decisions, label):
    """Each document of the burst routed once, whole; returns nothing."""
    inbox = os.path.join(tmp, "inbox")
    routed = os.path.join(tmp, "routed")
    want = {os.path.join(inbox, name_of(prefix, i)): document(seed, i) for i in range(count)}
    mine = [d for d in decisions if os.path.basename(d["source"]).startswith(prefix)]
    sources = [d["source"] for d in mine]
    expect(len(sources) == len(set(sources)),
           "%s: a document was decided twice (%d decisions, %d sources)"
           % (label, len(sources), len(set(sources))))
    expect(set(sources) == set(want),
           "%s: decided %d documents of %d; missing e.g. %s"
           % (label, len(set(sources)), len(want), sorted(set(want) - set(sources))[:3]))
    half_read = [d["source"] for d in mine
                 if d["source"] in want and d["digest"] != sha(want[d["source"]])]
    expect(not half_read, "%s: digests of partial documents: %s" % (label, half_read[:3]))
    for d in mine:
        dest = d["destination"]
        expect(dest.startswith(os.path.realpath(routed) + "/"),
               "%s: destination outside DEST: %s" % (label, dest))
        try:
            with open(dest, "rb") as f:
                got = f.read()
        except OSError as e:
            expect(False, "%s: %s: %s" % (label, dest, e))
            continue
        expect(got == want.get(d["source"]),
               "%s: %s does not hold the bytes of %s" % (label, dest, d["source"]))


def run(a):
    n1, n2 = (10_000, 2_000) if a.full else (2_000, 400)
    # On tmpfs when there is one: the test is about the watcher and the
    # router's bookkeeping under a burst, not the disk (delivery_kill_test.py
    # covers crashes on real filesystems), and a disk shared with builds
    # can take seconds for a few thousand small files.
    shm = "/dev/shm" if os.access("/dev/shm", os.W_OK) else None
    with tempfile.TemporaryDirectory(prefix="chute-watch-", dir=shm) as tmp:
        chute = rl.Chute(a.chute, tmp)
        rng = rl.rng_for(a.seed)
        rl.write_corpus(os.path.join(tmp, "l"), rng, 40)
        rl.write_corpus(os.path.join(tmp, "l2"), rng, 10, prefix="m")
        chute.run("init")
        chute.run("learn", "--tree", "l")
        v1 = chute.versions()[-1][0]
        inbox = os.path.join(tmp, "inbox")
        staging = os.path.join(tmp, "staging")
        os.mkdir(inbox)
        os.mkdir(staging)
        common = ("inbox", "--into", "routed", "--move", "--format", "jsonl", "--by", "watch-test",
                  "--settle", "0.5", "--rescan", "3")

        # --- The burst, with a learn in the middle of it.
        w = Watch(chute, *common)
        expect(w.wait_for(lambda: any("watching" in l for l in w.stderr), 30),
               "watch did not start: %s" % w.stderr)
        t0 = time.monotonic()
        producer = start_producer(a.chute, inbox, staging, a.seed, n1, "a")
        expect(w.wait_for(lambda: w.count() >= n1 // 4, 120),
               "a quarter of the burst was not routed: %d" % w.count())
        chute.run("learn", "--tree", "l2")
        v2 = chute.versions()[-1][0]
        expect(producer.wait(300) == 0, "the producer failed")
        expect(w.wait_for(lambda: w.count() >= n1, 300),
               "the burst was not routed: %d of %d decisions" % (w.count(), n1))
        seconds = time.monotonic() - t0
        # Rescans may still run: nothing more may come.
        time.sleep(1.5)
        rc, stop_seconds = w.stop()
        expect(rc == 0, "watch exited %s after SIGTERM: %s" % (rc, w.stderr[-5:]))
        print("burst: %d files routed in %.1f s (%.0f a second); stopped in %.2f s"
              % (w.count(), seconds, w.count() / seconds, stop_seconds))
        expect(w.count() == n1, "%d decisions for %d documents" % (w.count(), n1))
        check_burst(tmp, a.seed, n1, "a", w.decisions, "burst")
        versions = sorted({d["model_version"] for d in w.decisions})
        expect(versions == [v1, v2],
               "decisions name model versions %s, not %d then %d" % (versions, v1, v2))
        first_v2 = min(i for i, d in enumerate(w.decisions) if d["model_version"] == v2) \
            if v2 in versions else len(w.decisions)
        expect(all(d["model_version"] == v2 for d in w.decisions[first_v2:]),
               "a decision went back to the old model after the new one was loaded")
        expect(any("model version %d loaded" % v2 in l for l in w.stderr),
               "stderr does not say the new model was loaded: %s" % w.stderr)
        expect(all(d["by"] == "watch-test" for d in w.decisions), "by is not recorded")
        left = sorted(os.listdir(inbox))
        expect(all(n.startswith(".a-keep-") for n in left) and len(left) >= DOT_FILES,
               "the inbox holds more or less than the dot files: %s" % left[:5])
        for n in left:
            with open(os.path.join(inbox, n), "rb") as f:
                expect(f.read().startswith(b"never renamed "), "dot file %s changed" % n)
        routed_files = rl.files_below(os.path.join(tmp, "routed"))
        temps = [p for p in routed_files if os.path.basename(p).startswith(".")]
        expect(not temps, "temporary files left in DEST: %s" % temps[:3])
        expect(len(routed_files) == n1, "%d files in DEST for %d documents"
               % (len(routed_files), n1))

        # --- SIGTERM in the middle of a second burst.
        w = Watch(chute, *common)
        expect(w.wait_for(lambda: any("watching" in l for l in w.stderr), 30),
               "watch did not start again: %s" % w.stderr)
        producer = start_producer(a.chute, inbox, staging, a.seed + 1, n2, "b")
        expect(w.wait_for(lambda: w.count() >= n2 // 4, 120),
               "the second burst was not routed: %d" % w.count())
        rc, stop_seconds = w.stop()
        expect(rc == 0, "watch exited %s after SIGTERM: %s" % (rc, w.stderr[-5:]))
        expect(stop_seconds < 5, "watch took %.1f s to stop" % stop_seconds)
        expect(any("stopped by SIGTERM" in l for l in w.stderr),
               "stderr does not say SIGTERM stopped it: %s" % w.stderr[-3:])
        print("SIGTERM after %d of %d files: exit %d in %.2f s"
              % (w.count(), n2, rc, stop_seconds))
        expect(producer.wait(300) == 0, "the producer failed")
        # Every document is in the inbox or in exactly one destination.
        inbox_files = {n: b for n, b in rl.files_below(inbox).items() if not n.startswith(".")}
        routed_files = rl.files_below(os.path.join(tmp, "routed"))
        by_bytes = {}
        for p, b in routed_files.items():
            by_bytes.setdefault(b, []).append(p)
        for i in range(n2):
            data = document(a.seed + 1, i)
            in_inbox = inbox_files.get(name_of("b", i)) == data
            copies = len(by_bytes.get(data, []))
            expect(in_inbox + copies == 1,
                   "%s: in the inbox %s, %d copies in DEST" % (name_of("b", i), in_inbox, copies))
        first = list(w.decisions)

        # --- A second watch routes the rest; a clean stop left no delivery
        # for it to finish.
        w = Watch(chute, *common)
        expect(w.wait_for(lambda: any("watching" in l for l in w.stderr), 30),
               "watch did not start a third time: %s" % w.stderr)
        expect(not any("interrupted run" in l for l in w.stderr),
               "SIGTERM left deliveries unfinished: %s" % w.stderr[:2])
        rest = n2 - len(first)
        expect(w.wait_for(lambda: w.count() >= rest, 120),
               "the rest was not routed: %d of %d" % (w.count(), rest))
        time.sleep(1)
        rc, _ = w.stop()
        expect(rc == 0, "the second watch exited %s" % rc)
        check_burst(tmp, a.seed + 1, n2, "b", first + w.decisions, "second burst")

        # The log: one delivered row per document of both bursts.
        log = [json.loads(l) for l in chute.run("log", "--format", "jsonl").stdout.splitlines()]
        sources = [r["source"] for r in log]
        expect(len(log) == n1 + n2 and len(set(sources)) == n1 + n2,
               "the log has %d rows for %d sources, not %d" % (len(log), len(set(sources)),
                                                                n1 + n2))
        expect(all(r["destination"] for r in log), "a log row without destination")
        copy_and_folders(chute, tmp)
        linked(chute, tmp)
        usage(chute, tmp)
    return checks.exit_status("watch: every document routed once, whole; SIGTERM exits 0")


def copy_and_folders(chute, tmp):
    """--copy --recursive: folders made while watching are routed; a restart
    skips what was delivered; a file written again is routed again."""
    box = os.path.join(tmp, "box")
    os.makedirs(os.path.join(box, "old"))
    for i in range(5):  # there before the start: found by the first scan
        with open(os.path.join(box, "old", "o%d.txt" % i), "wb") as f:
            f.write(document(77, i))
    args = ("box", "--into", "copies", "--copy", "--recursive", "--format", "jsonl",
            "--settle", "0.3", "--rescan", "1")
    w = Watch(chute, *args)
    expect(w.wait_for(lambda: any("watching" in l for l in w.stderr), 30), "no start")
    os.makedirs(os.path.join(box, "day", "late"))
    for i in range(5, 10):
        with open(os.path.join(box, "day", "late", "n%d.txt" % i), "wb") as f:
            f.write(document(77, i))
    expect(w.wait_for(lambda: w.count() >= 10, 30), "copy: %d of 10 routed" % w.count())
    time.sleep(1.5)  # a rescan passes: nothing again
    rc, _ = w.stop()
    expect(rc == 0 and w.count() == 10, "copy: exit %s, %d decisions for 10" % (rc, w.count()))
    below = sorted(os.path.relpath(d["source"], os.path.realpath(box)) for d in w.decisions)
    expect(below == sorted(["old/o%d.txt" % i for i in range(5)] +
                           ["day/late/n%d.txt" % i for i in range(5, 10)]),
           "copy: routed %s" % below)
    expect(len(rl.files_below(box)) == 10, "copy: the inbox lost files")
    # A restart finds the ten again and skips them; one written again goes.
    w = Watch(chute, *args)
    expect(w.wait_for(lambda: any("watching" in l for l in w.stderr), 30), "no restart")
    time.sleep(1)
    with open(os.path.join(box, "old", "o0.txt"), "ab") as f:
        f.write(b" and a postscript")
    expect(w.wait_for(lambda: w.count() >= 1, 30), "copy: the file written again was not routed")
    time.sleep(1)
    rc, _ = w.stop()
    expect(rc == 0, "copy: the restart exited %s" % rc)
    expect([os.path.basename(d["source"]) for d in w.decisions] == ["o0.txt"],
           "copy: after the restart, routed %s" % [d["source"] for d in w.decisions])
    expect(any("skipped 10" in l for l in w.stderr),
           "copy: the restart did not skip the ten delivered: %s" % w.stderr[-1:])


def linked(chute, tmp):
    """--link: each file is linked once; the rescans that follow (the link
    changed the files' ctime) neither decide nor skip them again."""
    box = os.path.join(tmp, "lbox")
    os.makedirs(box)
    w = Watch(chute, "lbox", "--into", "links", "--link", "--settle", "0.2", "--rescan", "0.3")
    expect(w.wait_for(lambda: any("watching" in l for l in w.stderr), 30), "link: no start")
    for i in range(10):
        with open(os.path.join(box, "k%d.txt" % i), "wb") as f:
            f.write(document(78, i))
    expect(w.wait_for(lambda: w.count() >= 10, 30), "link: %d of 10 routed" % w.count())
    time.sleep(1.5)  # several rescans
    rc, _ = w.stop()
    expect(rc == 0 and w.count() == 10, "link: exit %s, %d decisions" % (rc, w.count()))
    expect(any("delivered 10 " in l and "skipped 0," in l for l in w.stderr),
           "link: files handed out again: %s" % w.stderr[-1:])
    for d in w.decisions:
        expect(os.path.samefile(d["source"], d["destination"]),
               "link: %s is not a hard link of its source" % d["destination"])


def usage(chute, tmp):
    """Usage errors exit 2; a missing inbox exits 1; CSV has the log's header."""
    os.makedirs(os.path.join(tmp, "u", "inbox"))
    for args, status in ((("u/inbox", "--into", "u/dest"), 2),
                         (("u/inbox", "--into", "u/dest", "--move", "--copy"), 2),
                         (("u/inbox", "--into", "u/inbox/dest", "--move"), 2),
                         (("u/missing", "--into", "u/dest", "--move"), 1)):
        p = chute.run("watch", *args, check=False)
        expect(p.returncode == status and p.stderr.count("\n") >= 1,
               "watch %s: exit %d, not %d: %s" % (" ".join(args), p.returncode, status, p.stderr))
    w = subprocess.Popen(chute.args("watch", "u/inbox", "--into", "u/dest", "--move",
                                    "--format", "csv"),
                         cwd=chute.cwd, env=chute.env(), stdout=subprocess.PIPE,
                         stderr=subprocess.PIPE)
    header = w.stdout.readline()
    w.send_signal(signal.SIGINT)
    rc = w.wait(20)
    expect(header == b"digest,source,destination,queue,confidence,runner_up,"
                     b"runner_up_posterior,held,model_version,time,by\r\n",
           "csv header %r" % header)
    expect(rc == 0, "SIGINT: exit %d" % rc)
    expect(b"stopped by SIGINT" in w.stderr.read(), "SIGINT not named")


def main():
    if len(sys.argv) > 2 and sys.argv[2] == "--produce":
        inbox, staging, seed, count, prefix = sys.argv[3:8]
        produce(inbox, staging, int(seed), int(count), prefix)
        return 0
    return run(rl.parse_arguments(5011, "10,000 files in the burst, not 2,000"))


if __name__ == "__main__":
    sys.exit(main())
