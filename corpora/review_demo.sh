#!/usr/bin/env bash
# The folder workflow with the demo corpus: route the inbox into queue
# folders with a review threshold and an audit sample; a reviewer (simulated
# from the inbox's answer key) moves every held document into the folder it
# belongs in and two misrouted documents out of the wrong queue's folder; the
# nightly correction learns the moves; then the production figures and the
# drift report. The README's examples of correct --from-folders, evaluate
# --from-log and drift were made with it.
#   usage: corpora/review_demo.sh [path/to/chute]
set -euo pipefail
cd "$(dirname "$0")/.."
chute=$(realpath "${1:-build/chute}")
corpus=$(realpath corpora/port-authority)
work=build/review-demo
rm -rf "$work"
mkdir -p "$work"
cp -r "$corpus/inbox" "$work/inbox"
cd "$work"
"$chute" init --db harbour.db > /dev/null
"$chute" learn --db harbour.db --tree "$corpus/labelled/" > /dev/null
echo "== chute route inbox/ --into routed/ --move --hold-below 0.9 --audit-share 0.1 --audit-seed 1"
"$chute" route --db harbour.db inbox/ --into routed/ --move --hold-below 0.9 \
  --audit-share 0.1 --audit-seed 1 --by intake --format csv > routed.csv
echo "$(($(wc -l < routed.csv) - 1)) documents routed"
echo
echo "== a reviewer moves files"
/usr/bin/python3 - "$corpus/inbox-key.csv" <<'PY'
import csv, os, sys
key = {os.path.basename(r["path"]): r["queue"] for r in csv.DictReader(open(sys.argv[1], encoding="utf-8"))}
def move(folder, name, queue):
    os.makedirs(os.path.join("routed", queue), exist_ok=True)
    os.rename(os.path.join("routed", folder, name), os.path.join("routed", queue, name))
    print("mv routed/%s/%s routed/%s/" % (folder, name, queue))
# Every held document to the queue it belongs in.
for name in sorted(os.listdir("routed/_review")):
    move("_review", name, key[name])
# Two documents chute routed to the wrong queue, moved where they belong.
wrong = []
for queue in sorted(os.listdir("routed")):
    if queue.startswith("_") or queue.startswith("."):
        continue
    for name in sorted(os.listdir(os.path.join("routed", queue))):
        if name in key and key[name] != queue:
            wrong.append((queue, name))
for queue, name in wrong[:2]:
    move(queue, name, key[name])
PY
echo
echo "== chute correct --from-folders routed/ --by nightly"
"$chute" correct --db harbour.db --from-folders routed/ --by nightly
echo
echo "== chute evaluate --from-log"
"$chute" evaluate --db harbour.db --from-log
echo
echo "== chute drift --since 1d --min-decisions 10"
"$chute" drift --db harbour.db --since 1d --min-decisions 10
