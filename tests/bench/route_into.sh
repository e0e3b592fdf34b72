#!/bin/bash
# Routing into folders against routing alone (make bench, after run.sh):
# on the benchmark corpus (tests/bench/make_corpus.py; the one run.sh made
# in BUILD_DIR/bench/corpus, made here when missing), a store learns
# train/ once; then, per pair (BENCH_INTO_PAIRS, default 3):
#   plain   `chute route --db DB inbox --format jsonl`: score and print
#   move    `chute route --db DB inbox --into dest --move --format jsonl`:
#           the same, plus logging each decision and moving each file into
#           DEST/<queue>/ on the same filesystem
# where inbox is a fresh copy of test/ (copied, synced and read once into
# the page cache before the pair; not timed) and DB a fresh copy of the
# learned store (so each move run starts with an empty log).
# Goal (issue 5): move keeps at least 80 % of plain's throughput, i.e.
# plain seconds / move seconds >= 0.80 (both route the same documents).
# Wall seconds by GNU time; medians over the pairs; the 1-minute load
# average is printed, since other work skews every figure.
#   usage: tests/bench/route_into.sh BUILD_DIR
# Environment: BENCH_INTO_PAIRS (3); BENCH_CORPUS (default
# BUILD_DIR/bench/corpus); BENCH_MEGABYTES (100), only when the corpus is
# made here.
set -euo pipefail
here=$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)
build=${1:-build}
chute=$build/chute
corpus=${BENCH_CORPUS:-$build/bench/corpus}
work=$build/bench/into
pairs=${BENCH_INTO_PAIRS:-3}
[[ -x $chute ]] || { echo "route_into.sh: $chute not built" >&2; exit 1; }
/usr/bin/python3 "$here/make_corpus.py" "$corpus" --megabytes "${BENCH_MEGABYTES:-100}"
rm -rf "$work"
mkdir -p "$work"
"$chute" init --db "$work/learned.db" >/dev/null
"$chute" learn --db "$work/learned.db" --tree "$corpus/train" >/dev/null

timed() {  # label, stdout file, command...: appends "label seconds" to $work/times
  local rc=0
  /usr/bin/time -f '%e' -o "$work/t" "${@:3}" >"$2" 2>"$work/err" || rc=$?
  if ((rc != 0)); then
    echo "route_into.sh: $1 failed (exit $rc): $(head -3 "$work/err")" >&2
    exit 1
  fi
  echo "$1 $(tail -1 "$work/t")" >>"$work/times"
}
fresh_inbox() {
  rm -rf "$work/inbox" "$work/dest"
  cp -r "$corpus/test" "$work/inbox"
  sync
  find "$work/inbox" -type f -print0 | xargs -0 cat >/dev/null
}

documents=$(find "$corpus/test" -type f | wc -l)
megabytes=$(du -sb "$corpus/test" | awk '{ printf "%.1f", $1 / 1e6 }')
echo "route --into --move vs route: $documents documents ($megabytes MB), $pairs pairs;" \
  "load $(cut -d' ' -f1 /proc/loadavg)"
rm -f "$work/times"
for ((i = 1; i <= pairs; i++)); do
  fresh_inbox
  cp "$work/learned.db" "$work/pair.db"
  rm -f "$work/pair.db-wal" "$work/pair.db-shm"
  timed plain "$work/plain.jsonl" "$chute" route --db "$work/pair.db" "$work/inbox" --format jsonl
  timed move "$work/move.jsonl" "$chute" route --db "$work/pair.db" "$work/inbox" \
    --into "$work/dest" --move --format jsonl
  # Both did the work: every document routed, and moved.
  left=$(find "$work/inbox" -type f | wc -l)
  moved=$(find "$work/dest" -type f | wc -l)
  plain_lines=$(wc -l <"$work/plain.jsonl")
  move_lines=$(wc -l <"$work/move.jsonl")
  if ((left != 0 || moved != documents || plain_lines != documents || move_lines != documents)); then
    echo "route_into.sh: pair $i: $plain_lines routed, $move_lines delivered, $moved moved," \
      "$left left in the inbox, of $documents" >&2
    exit 1
  fi
done
/usr/bin/python3 - "$work/times" "$documents" "$megabytes" "$(cut -d' ' -f1 /proc/loadavg)" <<'PY'
import statistics, sys
t = {}
for line in open(sys.argv[1]):
    k, v = line.split()
    t.setdefault(k, []).append(float(v))
docs, mb = int(sys.argv[2]), float(sys.argv[3])
m = {k: statistics.median(v) for k, v in t.items()}
for k in ("plain", "move"):
    print("%-6s median %6.2f s  %8.0f documents/s  %6.1f MB/s   runs %s" % (
        k, m[k], docs / m[k], mb / m[k], " ".join("%.2f" % x for x in t[k])))
print("route --into --move keeps %.0f %% of route's throughput (goal >= 80 %%)"
      % (100 * m["plain"] / m["move"]))
print("load after: %s" % sys.argv[4])
PY
