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
