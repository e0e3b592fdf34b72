#!/usr/bin/env bash
# make demo: learn the port-authority corpus, route its inbox, and score the
# routing against the inbox's answer key.
#   usage: corpora/demo.sh [path/to/chute]
set -euo pipefail
cd "$(dirname "$0")/.."
chute=${1:-build/chute}
corpus=corpora/port-authority
work=build/demo
mkdir -p "$work"
db=$work/harbour.db
rm -f "$db" "$db-wal" "$db-shm"

echo "== chute init --db $db"
"$chute" init --db "$db"
echo
echo "== chute learn --tree $corpus/labelled/"
"$chute" learn --db "$db" --tree "$corpus/labelled/"
echo
echo "== chute queues"
"$chute" queues --db "$db"
echo
echo "== chute route $corpus/inbox/"
"$chute" route --db "$db" "$corpus/inbox/"
"$chute" route --db "$db" "$corpus/inbox/" --format csv > "$work/inbox-routed.csv"
echo
echo "== accuracy on the inbox, against $corpus/inbox-key.csv"
/usr/bin/env python3 corpora/score_inbox.py "$corpus/inbox-key.csv" "$work/inbox-routed.csv"
echo
echo "== the reviewer loop: a reviewer files the missed letters where they belong"
# The corrections a reviewer would write: each inbox letter routed to the
# wrong queue, with the queue of the answer key.
/usr/bin/env python3 - "$corpus/inbox-key.csv" "$work/inbox-routed.csv" "$work" > "$work/fixes.csv" <<'PY'
import csv, os, sys
key = {r["path"]: r["queue"] for r in csv.DictReader(open(sys.argv[1], encoding="utf-8"))}
print("path,queue")
for r in csv.DictReader(open(sys.argv[2], encoding="utf-8")):
    want = key.get(r["file"]) or key.get(r["file"].split("/", 2)[-1])
    if want and want != r["queue"]:
        # Paths in a corrections file are relative to the file's folder.
        print("%s,%s" % (os.path.relpath(r["file"], sys.argv[3]), want))
PY
cat "$work/fixes.csv"
echo
echo "== chute correct fixes.csv --candidate, then chute promote (the nightly step)"
"$chute" correct --db "$db" "$work/fixes.csv" --candidate --by reviewer
status=0
"$chute" promote --db "$db" --by nightly || status=$?
if [ "$status" -ne 0 ] && [ "$status" -ne 4 ]; then exit "$status"; fi
echo
echo "== chute versions"
"$chute" versions --db "$db"
echo
echo "== chute check"
"$chute" check --db "$db"
echo
echo "== routing into folders (corpora/review_demo.sh, in build/review-demo/)"
corpora/review_demo.sh "$chute"
