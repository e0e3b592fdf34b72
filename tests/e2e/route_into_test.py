#!/usr/bin/python3
"""`chute route --into`, `chute log` and the queues' routing rules, end to
end: the built binary in temporary folders.

    route_into_test.py path/to/chute [unittest arguments]

Delivery (move, copy, link; -2 names; nothing overwritten), the review
folder and each held reason with the precedence of --hold-below over a
queue's threshold, the audit sample (seeded, the same draw again), dry
runs, --copy's skip and --again, the log's fields and filters, unreadable
documents remembered and set aside, hostile file names, symbolic links in
the inbox and a queue folder replaced by one, and the usage errors.
"""

import csv
import hashlib
import io
import json
import os
import sqlite3
import subprocess
import sys
import tempfile
import time
import unittest

CHUTE = None  # set from the command line

FIELDS = ["digest", "source", "destination", "queue", "confidence", "runner_up",
          "runner_up_posterior", "held", "model_version", "time", "by"]

BILLING = "invoice payment refund dues fee statement balance receipt"
BERTHS = "berth pier vessel mooring quay pilot tug arrival"


def sha256(data):
    return hashlib.sha256(data).hexdigest()


def tree(root):
    """{relative path (bytes): (bytes of the file | 'link:' + target)} below root."""
    out = {}
    root = os.fsencode(root)
    for dirpath, dirs, names in os.walk(root):
        for name in names + [d for d in dirs if os.path.islink(os.path.join(dirpath, d))]:
            p = os.path.join(dirpath, name)
            rel = os.path.relpath(p, root)
            if os.path.islink(p):
                out[rel] = b"link:" + os.readlink(p)
            else:
                with open(p, "rb") as f:
                    out[rel] = f.read()
    return out


class RouteIntoTest(unittest.TestCase):
    def setUp(self):
        self._tmp = tempfile.TemporaryDirectory(prefix="chute-route-into-")
        self.dir = self._tmp.name
        self.chute("init")
        for i in range(6):
            self.write("l/billing/%d.txt" % i, "%s number %d\n" % (BILLING, i))
            self.write("l/berths/%d.txt" % i, "%s number %d\n" % (BERTHS, i))
        self.chute("learn", "--tree", "l")

    def tearDown(self):
        self._tmp.cleanup()

    # --- helpers ---

    def path(self, rel):
        return os.path.join(self.dir, rel)

    def write(self, rel, text):
        p = self.path(rel) if isinstance(rel, str) else os.path.join(os.fsencode(self.dir), rel)
        os.makedirs(os.path.dirname(p), exist_ok=True)
        with open(p, "wb") as f:
            f.write(text.encode() if isinstance(text, str) else text)
        return p

    def run_chute(self, *args, env=None):
        e = dict(os.environ)
        e.pop("CHUTE_DB", None)
        e.pop("CHUTE_TEST_FORCE_COPY", None)
        e.update(env or {})
        args = [a if isinstance(a, bytes) else a.encode() for a in args]
        cmd = [os.fsencode(CHUTE), args[0], b"--db", b"s.db", *args[1:]]
        p = subprocess.run(cmd, cwd=self.dir, env=e, capture_output=True)
        return p.returncode, p.stdout.decode(errors="replace"), p.stderr.decode(errors="replace")

    def chute(self, *args, expect=0, env=None):
        code, out, err = self.run_chute(*args, env=env)
        self.assertEqual(code, expect, "chute %s: %s%s" % (" ".join(map(str, args)), out, err))
        return out, err

    def route(self, *extra, expect=0, inbox="inbox", dest="routed"):
        out, err = self.chute("route", inbox, "--into", dest, "--format", "jsonl", *extra,
                              expect=expect)
        return [json.loads(line) for line in out.splitlines()], err

    def log(self, *extra):
        out, _ = self.chute("log", "--format", "jsonl", *extra)
        return [json.loads(line) for line in out.splitlines()]

    def inbox_docs(self, n=4):
        for i in range(n):
            self.write("inbox/b%d.txt" % i, "%s letter %d\n" % (BILLING, i))
            self.write("inbox/m%d.txt" % i, "%s letter %d\n" % (BERTHS, i))

    # --- delivery ---

    def test_move_files_each_document_into_its_queue_folder(self):
        self.inbox_docs()
        before = tree(self.path("inbox"))
        rows, _ = self.route("--move", "--by", "tester")
        self.assertEqual(len(rows), 8)
        self.assertEqual(tree(self.path("inbox")), {})
        after = tree(self.path("routed"))
        self.assertEqual(sorted(after), sorted(
            [b"billing/b%d.txt" % i for i in range(4)] + [b"berths/m%d.txt" % i for i in range(4)]))
        for rel, data in before.items():
            folder = b"billing" if rel.startswith(b"b") else b"berths"
            self.assertEqual(after[folder + b"/" + rel], data)
        for r in rows:
            self.assertEqual(list(r), FIELDS)
            self.assertIsNone(r["held"])
            self.assertEqual(r["by"], "tester")
            self.assertTrue(os.path.isabs(r["source"]) and os.path.isabs(r["destination"]))
            self.assertEqual(r["source"], self.path("inbox/" + os.path.basename(r["source"])))
            self.assertEqual(os.path.dirname(r["destination"]),
                             os.path.realpath(self.path("routed/" + r["queue"])))
            with open(r["destination"], "rb") as f:
                self.assertEqual(sha256(f.read()), r["digest"])
        logged = self.log()
        self.assertEqual(logged, rows)

    def test_copy_keeps_the_source_and_skips_documents_copied_before_unless_again(self):
        self.inbox_docs(2)
        before = tree(self.path("inbox"))
        rows, _ = self.route("--copy")
        self.assertEqual(len(rows), 4)
        self.assertEqual(tree(self.path("inbox")), before)
        rows, err = self.chute("route", "inbox", "--into", "routed", "--copy")
        self.assertIn("skipped 4", err)
        rows, _ = self.route("--copy")
        self.assertEqual(rows, [])
        self.assertEqual(len(self.log()), 4)
        rows, _ = self.route("--copy", "--again")
        self.assertEqual(len(rows), 4)
        self.assertTrue(all(r["destination"].endswith("-2.txt") for r in rows), rows)
        self.assertEqual(len(self.log()), 8)
        # Moving is never skipped: the documents leave the inbox.
        rows, _ = self.route("--move")
        self.assertEqual(len(rows), 4)
        self.assertEqual(tree(self.path("inbox")), {})

    def test_link_makes_hard_links_and_skips_them_on_a_rerun(self):
        self.inbox_docs(2)
        rows, _ = self.route("--link")
        self.assertEqual(len(rows), 4)
        for r in rows:
            self.assertEqual(os.stat(r["source"]).st_ino, os.stat(r["destination"]).st_ino)
        rows, _ = self.route("--link")
        self.assertEqual(rows, [])

    def test_link_across_filesystems_is_refused_and_leaves_no_log_row(self):
        if not os.path.isdir("/dev/shm"):
            self.skipTest("no /dev/shm")
        self.inbox_docs(1)
        with tempfile.TemporaryDirectory(dir="/dev/shm") as dest:
            self.assertNotEqual(os.stat(self.path("inbox")).st_dev, os.stat(dest).st_dev)
            rows, err = self.route("--link", dest=dest, expect=3)
            self.assertEqual(rows, [])
            self.assertIn("another filesystem", err)
            self.assertEqual(len(tree(self.path("inbox"))), 2)
        self.assertEqual(self.log(), [])

    def test_a_taken_name_gets_a_number_and_nothing_is_overwritten(self):
        self.write("routed/billing/x.txt", "someone else's file\n")
        self.write("inbox/a/x.txt", BILLING + " one\n")
        self.write("inbox/b/x.txt", BILLING + " two\n")
        self.write("inbox/c/x", BILLING + " three\n")
        self.write("inbox/d/x", BILLING + " four\n")
        rows, _ = self.route("--move")
        got = sorted(os.path.basename(r["destination"]) for r in rows)
        self.assertEqual(got, ["x", "x-2", "x-2.txt", "x-3.txt"])
        with open(self.path("routed/billing/x.txt")) as f:
            self.assertEqual(f.read(), "someone else's file\n")

    def test_many_batches_with_repeated_names_deliver_each_document_once(self):
        # 1100 documents whose names repeat every 100: with batches of 7
        # (CHUTE_TEST_DELIVERY_BATCH) and of 512, one batch is delivered
        # while the next is decided, and names are never given twice.
        for size in ("7", ""):
            for i in range(1100):
                self.write("inbox/f%d/%03d.txt" % (i // 100, i % 100),
                           "%s batch %s doc %d\n" % (BILLING if i % 3 else BERTHS, size, i))
            env = {"CHUTE_TEST_DELIVERY_BATCH": size} if size else {}
            out, _ = self.chute("route", "inbox", "--into", "routed-" + (size or "512"),
                                "--move", "--format", "jsonl", env=env)
            rows = [json.loads(line) for line in out.splitlines()]
            self.assertEqual(len(rows), 1100)
            self.assertEqual(len({r["destination"] for r in rows}), 1100)
            self.assertEqual(tree(self.path("inbox")), {})
            for r in rows:
                with open(r["destination"], "rb") as f:
                    self.assertEqual(sha256(f.read()), r["digest"])
        self.assertEqual(len(self.log()), 2200)

    # --- review: held reasons, precedence, audit ---

    def test_no_terms_goes_to_review_with_the_best_guess(self):
        self.write("inbox/strange.txt", "zzyzx qwerty\n")
        rows, _ = self.route("--move")
        self.assertEqual(rows[0]["held"], "no_terms")
        self.assertIn(rows[0]["queue"], ("billing", "berths"))
        self.assertEqual(os.path.dirname(rows[0]["destination"]),
                         os.path.realpath(self.path("routed/_review")))
        self.assertTrue(os.path.exists(self.path("routed/_review/strange.txt")))

    def test_min_documents_holds_a_queue_with_too_few_documents(self):
        self.chute("queues", "--set-min-documents", "billing", "7")
        self.inbox_docs(1)
        self.write("inbox/strange.txt", "zzyzx qwerty\n")
        rows, _ = self.route("--move")
        held = {os.path.basename(r["source"]): r["held"] for r in rows}
        self.assertEqual(held["b0.txt"], "min_documents")
        self.assertIsNone(held["m0.txt"])
        self.assertEqual(held["strange.txt"], "no_terms")  # no_terms comes first
        self.chute("queues", "--set-min-documents", "billing", "6")
        self.write("inbox/b9.txt", BILLING + " again\n")
        rows, _ = self.route("--move")
        self.assertIsNone(rows[0]["held"])

    def test_hold_below_overrides_the_queue_threshold(self):
        # A mixed document: unsure, but above 0.5 for its winner.
        self.write("inbox/mixed.txt", "invoice payment refund berth pier\n")
        rows, _ = self.route("--move", "--dry-run")
        confidence = rows[0]["confidence"]
        self.assertTrue(0.5 < confidence < 1, confidence)
        queue = rows[0]["queue"]
        self.chute("queues", "--set-threshold", queue, "1")
        rows, _ = self.route("--move", "--dry-run")
        self.assertEqual(rows[0]["held"], "threshold")
        rows, _ = self.route("--move", "--dry-run", "--hold-below", "0.5")
        self.assertIsNone(rows[0]["held"])
        rows, _ = self.route("--move", "--dry-run", "--hold-below", str(confidence))
        self.assertIsNone(rows[0]["held"])  # not below its own confidence
        rows, _ = self.route("--move", "--dry-run", "--hold-below", "0.9999999")
        self.assertEqual(rows[0]["held"], "threshold")
        self.chute("queues", "--set-threshold", queue, "none")
        rows, _ = self.route("--move", "--dry-run")
        self.assertIsNone(rows[0]["held"])

    def test_audit_share_draws_the_same_documents_for_the_same_seed(self):
        for i in range(40):
            self.write("inbox/d%02d.txt" % i, "%s letter %d\n" % (BILLING if i % 2 else BERTHS, i))
        self.write("inbox/strange.txt", "zzyzx qwerty\n")

        def audited(*extra):
            rows, err = self.route("--move", "--dry-run", "--audit-share", "0.5", *extra)
            return {r["source"] for r in rows if r["held"] == "audit"}, rows, err

        a, rows, _ = audited("--audit-seed", "7")
        b, _, _ = audited("--audit-seed", "7")
        c, _, _ = audited("--audit-seed", "8")
        self.assertEqual(a, b)
        self.assertNotEqual(a, c)
        self.assertTrue(5 <= len(a) <= 35, len(a))
        # Only documents routed automatically are drawn.
        held = {os.path.basename(r["source"]): r["held"] for r in rows}
        self.assertEqual(held["strange.txt"], "no_terms")
        # Without a seed, the seed is printed, and with it the draw repeats.
        _, _, err = audited()
        seed = err.split("audit seed ")[1].split()[0]
        d, _, _ = audited("--audit-seed", seed)
        e, _, _ = audited("--audit-seed", seed)
        self.assertEqual(d, e)
        # The real run draws as the dry run did; audit documents go to review.
        rows, _ = self.route("--move", "--audit-share", "0.5", "--audit-seed", "7")
        self.assertEqual({r["source"] for r in rows if r["held"] == "audit"}, a)
        for r in rows:
            if r["held"] == "audit":
                self.assertIn("/_review/", r["destination"])
        # Shares 0 and 1.
        self.inbox_docs(2)
        rows, _ = self.route("--move", "--dry-run", "--audit-share", "1", "--audit-seed", "1")
        self.assertTrue(all(r["held"] == "audit" for r in rows))
        rows, _ = self.route("--move", "--dry-run", "--audit-share", "0", "--audit-seed", "1")
        self.assertTrue(all(r["held"] is None for r in rows))

    # --- dry run ---

    def test_dry_run_moves_creates_and_logs_nothing(self):
        self.inbox_docs(2)
        before = tree(self.path("inbox"))
        rows, err = self.route("--move", "--dry-run", "--hold-below", "0.99999")
        self.assertEqual(len(rows), 4)
        self.assertIn("would deliver 4", self.chute("route", "inbox", "--into", "routed",
                                                    "--move", "--dry-run")[1])
        self.assertEqual(tree(self.path("inbox")), before)
        self.assertFalse(os.path.exists(self.path("routed")))
        self.assertEqual(self.log(), [])
        # Two documents of one name get distinct names even though none exists.
        self.write("inbox/z/b0.txt", BILLING + " another\n")
        rows, _ = self.route("--move", "--dry-run")
        names = [r["destination"] for r in rows]
        self.assertEqual(len(names), len(set(names)))

    # --- the log ---

    def test_log_prints_the_documented_fields_and_filters(self):
        self.inbox_docs(1)
        first, _ = self.route("--move")
        time.sleep(1.1)
        cut = time.strftime("%Y-%m-%dT%H:%M:%SZ", time.gmtime())
        self.write("inbox/b7.txt", BILLING + " later\n")
        second, _ = self.route("--move")
        self.assertEqual(self.log(), first + second)
        self.assertEqual(self.log("--since", cut), second)
        self.assertEqual(self.log("--since", "30m"), first + second)
        self.assertEqual(self.log("--since", "1h"), first + second)
        self.assertEqual(self.log("--since", "7d"), first + second)
        self.assertEqual(self.log("--queue", "berths"), [r for r in first if r["queue"] == "berths"])
        out, _ = self.chute("log", "--format", "csv")
        records = list(csv.reader(io.StringIO(out, newline="")))
        self.assertEqual(records[0], FIELDS)
        self.assertEqual(len(records), 4)
        self.assertEqual(records[1][0], first[0]["digest"])
        self.assertEqual(float(records[1][4]), first[0]["confidence"])
        self.chute("log", "--since", "yesterday", expect=2)
        out, _ = self.chute("log")
        self.assertIn("3 decisions", out)
        # route --into's CSV has the same header.
        self.write("inbox/b8.txt", BILLING + " csv\n")
        out, _ = self.chute("route", "inbox", "--into", "routed", "--move", "--format", "csv")
        self.assertEqual(list(csv.reader(io.StringIO(out, newline="")))[0], FIELDS)

    # --- unreadable documents ---

    def test_unreadable_is_reported_once_until_it_changes_and_can_be_set_aside(self):
        self.inbox_docs(1)
        bad = self.write("inbox/scan.bin", b"\x00\x01binary")
        rows, err = self.route("--move", expect=3)
        self.assertEqual(len(rows), 2)
        self.assertIn("scan.bin", err)
        self.assertTrue(os.path.exists(bad))
        # Unchanged: not read again, not reported again.
        rows, err = self.route("--move", expect=0)
        self.assertEqual(rows, [])
        self.assertNotIn("scan.bin", err)
        # Changed (its mtime): read again and reported again.
        os.utime(bad, (1, 1))
        _, err = self.route("--move", expect=3)
        self.assertIn("scan.bin", err)
        _, err = self.route("--move", expect=0)
        # Set aside: moved to _unreadable, reported with where it went.
        _, err = self.route("--move", "--set-aside", expect=3)
        self.assertIn("set aside at", err)
        self.assertFalse(os.path.exists(bad))
        with open(self.path("routed/_unreadable/scan.bin"), "rb") as f:
            self.assertEqual(f.read(), b"\x00\x01binary")
        # A changed file that now reads is routed.
        self.write("inbox/scan2.bin", b"\x00x")
        self.route("--move", expect=3)
        self.write("inbox/scan2.bin", BILLING + " fixed\n")
        rows, _ = self.route("--move")
        self.assertEqual(len(rows), 1)
        self.assertEqual(rows[0]["queue"], "billing")
        # The store remembers only the one set aside now; a remembered file
        # someone removed is forgotten by the next run.
        self.assertEqual(self.unreadable_rows(), [(os.path.abspath(self.path("inbox")) +
                                                   "/scan.bin", 1)])
        self.write("inbox/scan3.bin", b"\x00y")
        self.route("--move", expect=3)
        self.assertEqual(len(self.unreadable_rows()), 2)
        os.remove(self.path("inbox/scan3.bin"))
        self.route("--move")
        self.assertEqual(len(self.unreadable_rows()), 1)

    def unreadable_rows(self):
        """(path, set aside?) of the store's unreadable table (read-only)."""
        db = sqlite3.connect("file:%s?mode=ro" % self.path("s.db"), uri=True)
        try:
            return [(p, int(a is not None)) for p, a in
                    db.execute("SELECT path, set_aside FROM unreadable ORDER BY path")]
        finally:
            db.close()

    def test_too_large_is_unreadable_and_set_aside_in_a_dry_run_moves_nothing(self):
        big = self.write("inbox/big.txt", BILLING * 100)
        _, err = self.route("--move", "--set-aside", "--dry-run", "--max-bytes", "100", expect=3)
        self.assertIn("would be set aside", err)
        self.assertTrue(os.path.exists(big))

    # --- hostile names ---

    def test_hostile_names_are_delivered_byte_for_byte(self):
        names = [b"with space.txt", b"new\nline.txt", b"-leading-dash.txt",
                 b"\xff\xfe not utf-8.txt", b"n" * 251 + b".txt"]
        for i, n in enumerate(names):
            self.write(b"inbox/" + n, "%s hostile %d\n" % (BILLING, i))
        self.write(b"routed/billing/" + b"n" * 251 + b".txt", "taken\n")
        rows, _ = self.route("--move")
        self.assertEqual(len(rows), len(names))
        got = set(tree(self.path("routed/billing")))
        for n in names[:-1]:
            self.assertIn(n, got)
        long_names = [g for g in got if g.startswith(b"nnnn")]
        self.assertEqual(len(long_names), 2)
        self.assertTrue(all(len(g) <= 255 for g in long_names), long_names)
        self.assertEqual(tree(self.path("inbox")), {})

    def test_a_leading_dash_file_named_on_the_command_line(self):
        self.write("-dash.txt", BILLING + " dash\n")
        out, err = self.chute("route", "--into", "routed", "--move", "--format", "jsonl", "--",
                              "-dash.txt")
        rows = [json.loads(l) for l in out.splitlines()]
        self.assertEqual(len(rows), 1)
        self.assertTrue(os.path.exists(self.path("routed/billing/-dash.txt")))

    def test_symbolic_links_in_the_inbox_are_not_followed(self):
        target = self.write("outside/target.txt", BILLING + " target\n")
        os.makedirs(self.path("inbox"))
        os.symlink(target, self.path("inbox/link.txt"))
        os.symlink(self.path("outside"), self.path("inbox/linkdir"))
        self.inbox_docs(1)
        rows, err = self.route("--move", expect=3)
        self.assertEqual(len(rows), 2)
        self.assertIn("link.txt", err)
        self.assertTrue(os.path.islink(self.path("inbox/link.txt")))
        self.assertTrue(os.path.exists(target))
        self.assertEqual(sorted(tree(self.path("routed"))), [b"berths/m0.txt", b"billing/b0.txt"])

    def test_a_queue_folder_replaced_by_a_symbolic_link_is_refused(self):
        os.makedirs(self.path("elsewhere"))
        os.makedirs(self.path("routed"))
        os.symlink(self.path("elsewhere"), self.path("routed/billing"))
        self.inbox_docs(1)
        rows, err = self.route("--move", expect=3)
        self.assertEqual([r["queue"] for r in rows], ["berths"])
        self.assertIn("b0.txt", err)
        self.assertTrue(os.path.exists(self.path("inbox/b0.txt")))
        self.assertEqual(os.listdir(self.path("elsewhere")), [])
        self.assertEqual([r["queue"] for r in self.log()], ["berths"])

    # --- usage and the queues' rules ---

    def test_usage_errors(self):
        self.inbox_docs(1)
        self.chute("route", "inbox", "--into", "routed", expect=2)
        self.chute("route", "inbox", "--into", "routed", "--move", "--copy", expect=2)
        self.chute("route", "inbox", "--move", expect=2)
        self.chute("route", "inbox", "--hold-below", "0.5", expect=2)
        self.chute("route", "-", "--into", "routed", "--move", expect=2)
        self.chute("route", "inbox", "--into", "inbox/routed", "--move", expect=2)
        self.chute("route", "inbox", "--into", "routed", "--move", "--top", "2", expect=2)
        self.chute("route", "inbox", "--into", "routed", "--move", "--audit-share", "2",
                   expect=2)
        self.assertEqual(len(tree(self.path("inbox"))), 2)
        self.assertFalse(os.path.exists(self.path("routed")))
        self.assertFalse(os.path.exists(self.path("inbox/routed")))
        # Plain route still reads only.
        out, _ = self.chute("route", "inbox", "--format", "jsonl")
        self.assertEqual(len(out.splitlines()), 2)
        self.assertEqual(len(tree(self.path("inbox"))), 2)

    def test_queues_show_and_set_thresholds_and_minimums(self):
        self.chute("queues", "--set-threshold", "billing", "0.95")
        self.chute("queues", "--set-min-documents", "berths", "20")
        out, _ = self.chute("queues", "--format", "jsonl")
        q = {j["queue"]: j for j in map(json.loads, out.splitlines())}
        self.assertEqual(q["billing"]["threshold"], 0.95)
        self.assertIsNone(q["billing"]["min_documents"])
        self.assertIsNone(q["berths"]["threshold"])
        self.assertEqual(q["berths"]["min_documents"], 20)
        self.chute("queues", "--set-threshold", "billing", "none")
        self.chute("queues", "--set-min-documents", "berths", "none")
        out, _ = self.chute("queues", "--format", "jsonl")
        for j in map(json.loads, out.splitlines()):
            self.assertIsNone(j["threshold"])
            self.assertIsNone(j["min_documents"])
        self.chute("queues", "--set-threshold", "billing", "0", expect=2)
        self.chute("queues", "--set-threshold", "billing", "1.5", expect=2)
        self.chute("queues", "--set-min-documents", "billing", "-1", expect=2)
        self.chute("queues", "--set-threshold", "nosuch", "0.9", expect=1)
        out, _ = self.chute("queues", "--format", "csv")
        self.assertTrue(out.splitlines()[0].endswith(",threshold,min_documents"))


if __name__ == "__main__":
    CHUTE = os.path.abspath(sys.argv.pop(1))
    unittest.main()
