"""Shared pieces of the reliability tests (crash_test.py, concurrency_test.py).

A seeded generator of labelled documents, a runner for the built binary,
and readers of the store's versions and fingerprints.
"""

import argparse
import json
import os
import random
import shutil
import subprocess

QUEUES = ("berths", "billing", "customs", "marina")
# Each queue's own words; every document also draws from SHARED.
OWN_WORDS = {
    "berths": "berth pier vessel booking reservation quay arrival departure "
              "tug pilot draught mooring slot nights length beam",
    "billing": "invoice dues refund deposit payment unpaid statement fee "
               "account receipt balance credit tariff charge overdue",
    "customs": "declaration cargo manifest inspection duty tariff container "
               "seal bond clearance origin goods import export permit",
    "marina": "yacht pontoon sailing dinghy electricity water shower club "
              "regatta winter storage hoist mast slipway visitor",
}
SHARED = ("the a of for to and at on in with please we our your is was "
          "harbour office letter request thank regards date week month "
          "number reference attached kindly").split()


def make_text(rng, queue, words):
    own = OWN_WORDS[queue].split()
    return " ".join(rng.choice(own) if rng.random() < 0.4 else rng.choice(SHARED)
                    for _ in range(words))


def write_corpus(root, rng, per_queue, words=(20, 120), prefix="d"):
    """Writes ROOT/<queue>/<prefix>NNNN.txt; returns [(relative path, queue)].

    Each text ends with its own serial number, so no two documents share a
    digest.
    """
    made = []
    serial = 0
    for queue in QUEUES:
        os.makedirs(os.path.join(root, queue), exist_ok=True)
        for _ in range(per_queue):
            serial += 1
            name = os.path.join(queue, "%s%04d.txt" % (prefix, serial))
            text = make_text(rng, queue, rng.randint(*words))
            with open(os.path.join(root, name), "w", encoding="utf-8") as f:
                f.write("%s %s%d\n" % (text, prefix, serial))
            made.append((os.path.join(os.path.basename(root), name), queue))
    return made


def write_csv(path, header, rows):
    """RFC 4180 CSV; every field is quoted (paths may hold commas)."""
    def quote(field):
        return '"' + field.replace('"', '""') + '"'
    with open(path, "w", encoding="utf-8", newline="") as f:
        f.write(",".join(header) + "\r\n")
        for row in rows:
            f.write(",".join(quote(x) for x in row) + "\r\n")


class Chute:
    """Runs the binary in folder `cwd` against the store `db` (relative to cwd)."""

    def __init__(self, binary, cwd, db="s.db"):
        self.binary = binary
        self.cwd = cwd
        self.db = db

    def env(self, fault=None):
        env = dict(os.environ)
        env.pop("CHUTE_DB", None)
        env.pop("CHUTE_TEST_FAULT", None)
        if fault:
            env["CHUTE_TEST_FAULT"] = fault
        return env

    def args(self, command, *rest, db=None):
        return [self.binary, command, "--db", db or self.db, *rest]

    def run(self, command, *rest, db=None, fault=None, check=True):
        p = subprocess.run(self.args(command, *rest, db=db), cwd=self.cwd,
                           env=self.env(fault), capture_output=True, text=True)
        if check and p.returncode not in (0, 3):
            raise AssertionError("chute %s %s: exit %d\n%s" % (
                command, " ".join(rest), p.returncode, p.stderr))
        return p

    def popen(self, command, *rest, db=None, fault=None):
        return subprocess.Popen(self.args(command, *rest, db=db), cwd=self.cwd,
                                env=self.env(fault), stdout=subprocess.PIPE,
                                stderr=subprocess.PIPE, text=True)

    def versions(self, db=None):
        """[(version, fingerprint)], oldest first, as `chute versions` lists them."""
        p = self.run("versions", "--format", "jsonl", db=db)
        return [(v["version"], v["fingerprint"])
                for v in map(json.loads, p.stdout.splitlines())]

    def fingerprint(self, db=None):
        """The fingerprint of the current (newest) version."""
        return self.versions(db)[-1][1]

    def copy_store(self, to_db):
        """Copies the store file and its -wal, -shm files (no process may
        hold the store open). Returns to_db."""
        for suffix in ("", "-wal", "-shm"):
            src = os.path.join(self.cwd, self.db + suffix)
            dst = os.path.join(self.cwd, to_db + suffix)
            if os.path.exists(dst):
                os.remove(dst)
            if os.path.exists(src):
                shutil.copyfile(src, dst)
        return to_db


def files_below(root):
    """{path relative to root: bytes} of every file below root (links not
    followed)."""
    found = {}
    for folder, _, names in os.walk(root):
        for name in names:
            p = os.path.join(folder, name)
            with open(p, "rb") as f:
                found[os.path.relpath(p, root)] = f.read()
    return found


def rng_for(seed):
    return random.Random(seed)


class Checks:
    """Failed expectations, printed as they happen and counted at the end."""

    def __init__(self):
        self.failures = []

    def expect(self, ok, what):
        if not ok:
            self.failures.append(what)
            print("FAIL: " + what, flush=True)

    def exit_status(self, all_held):
        """Prints the outcome; 0 when nothing failed, else 1."""
        if self.failures:
            print("%d failures" % len(self.failures))
            return 1
        print(all_held)
        return 0


def parse_arguments(default_seed, full_help):
    """chute (the binary, made absolute), --full, --seed."""
    parser = argparse.ArgumentParser()
    parser.add_argument("chute")
    parser.add_argument("--full", action="store_true", help=full_help)
    parser.add_argument("--seed", type=int, default=default_seed)
    a = parser.parse_args()
    a.chute = os.path.abspath(a.chute)
    return a
