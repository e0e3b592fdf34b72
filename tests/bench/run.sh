#!/bin/bash
# The speed benchmark of chute (make bench; not part of make test).
#
#   tests/bench/run.sh [BUILD_DIR]      (default: build)
#
# What is measured, and how:
# - Whole processes, run the way a user runs them, on a seeded synthetic
#   corpus of about 100 MB of text documents in 8 queues
#   (tests/bench/make_corpus.py; made once into BUILD_DIR/bench/corpus and
#   kept while its version and seed stay the same): 80 % of the documents
#   (train/<queue>/...) are learned, the other 20 % (test/<queue>/...) are
#   routed.
#     chute learn:  `chute init --db DB` (not timed), then timed
#                   `chute learn --db DB --tree train/`
#     chute evaluate: `chute evaluate --db DB --folds 5` on the store just
#                   learned (5-fold cross-validation by subtracting stored
#                   counts; chute only, timed against chute learn: the
#                   ratio evaluate/learn must stay below 2)
#     peer learn:   tests/bench/peer_learn.py learn.csv model.pickle
#                   (scikit-learn CountVectorizer + MultinomialNB, pickled)
#     chute route:  `chute route --db DB test/ --format jsonl > file`
#     peer route:   tests/bench/peer_route.py model.pickle test/ > file
#     start-up:     each route command again on the first test document
#                   alone: the fixed cost (program start, imports, loading
#                   the model), so that per-document throughput can be told
#                   apart from it.
#   The peer runs under Debian's /usr/bin/python3 with OMP_NUM_THREADS=1 and
#   OPENBLAS_NUM_THREADS=1; other variables (OPENBLAS_CORETYPE, set on some
#   machines here) are left as they are.
# - Each process runs under GNU time (/usr/bin/time -f '%e %M %U %S'): wall
#   seconds, peak resident set size (KiB), user and system CPU seconds.
#   Start-up (Python and scikit-learn imports, ICU data, opening the store)
#   is part of the figure, as it is for a user.
# - Runs alternate, chute then peer, in BENCH_PAIRS pairs (default 5) of
#   (learn, evaluate, learn, route, route, start-up, start-up); each pair learns into
#   a fresh store and a fresh pickle. Reported: medians over the pairs. Before the first pair
#   every corpus file is read once, so all runs read from the page cache.
# - Throughput: input bytes (sum of the documents' file sizes; MB = 10^6
#   bytes) and documents, divided by the median wall time. Ratios are
#   chute/peer: throughput ratio = peer time / chute time (above 1: chute
#   faster); memory ratio = chute peak RSS / peer peak RSS. "Route without
#   start-up" divides by (route time - start-up time).
# - As a check that both did the work, the decisions of the last pair are
#   compared with the true queues (accuracy) and with each other.
# - Then chute_microbench (Google Benchmark: tokenizer bytes/s, scorer
#   documents/s) runs, 3 repetitions, medians.
# - The 1-minute load average is recorded before, between and after, since
#   other work on the machine skews every figure.
# Results: a table on standard output and BUILD_DIR/bench/results.json.
#
# Environment: BENCH_PAIRS (5), BENCH_MEGABYTES (100), BENCH_SEED (the
# generator's default), BENCH_WAIT_IDLE (seconds to wait, at most, for the
# 1-minute load average to fall below 1.0 before starting; default 0).
set -euo pipefail

here=$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)
build_arg=${1:-build}
if [[ ! -d $build_arg ]]; then
  echo "run.sh: build folder '$build_arg' not found (run the build first)" >&2
  exit 1
fi
build=$(cd "$build_arg" && pwd)
pairs=${BENCH_PAIRS:-5}
megabytes=${BENCH_MEGABYTES:-100}
wait_idle=${BENCH_WAIT_IDLE:-0}
py=/usr/bin/python3
timer=/usr/bin/time
chute=$build/chute
micro=$build/tests/bench/chute_microbench
out=$build/bench
corpus=$out/corpus
work=$out/work

for f in "$chute" "$micro"; do
  [[ -x $f ]] || { echo "run.sh: $f not built (configure with -DCHUTE_BENCH=ON and build)" >&2; exit 1; }
done
[[ -x $timer ]] || { echo "run.sh: $timer missing (Debian package 'time')" >&2; exit 1; }
"$py" -c 'import sklearn' 2>/dev/null ||
  { echo "run.sh: $py lacks scikit-learn (Debian package python3-sklearn)" >&2; exit 1; }

load1() { cut -d' ' -f1 /proc/loadavg; }

mkdir -p "$out"
seed_args=()
[[ -n ${BENCH_SEED:-} ]] && seed_args=(--seed "$BENCH_SEED")
"$py" "$here/make_corpus.py" "$corpus" --megabytes "$megabytes" "${seed_args[@]}"

# Read every document once so that all runs find them in the page cache.
find "$corpus/train" "$corpus/test" -type f -print0 | xargs -0 cat >/dev/null

if (( wait_idle > 0 )); then
  waited=0
  while awk -v l="$(load1)" 'BEGIN { exit !(l >= 1.0) }' && (( waited < wait_idle )); do
    echo "run.sh: load $(load1), waiting for the machine to settle" >&2
    sleep 10
    waited=$((waited + 10))
  done
fi

rm -rf "$work"
mkdir -p "$work/runs"
loads=(start "$(load1)")
echo "run.sh: load average at start: $(cat /proc/loadavg)" >&2

# measure TOOL STAGE PAIR STDOUT_FILE COMMAND...: runs COMMAND under GNU time
# into $work/runs/TOOL-STAGE-PAIR.time; stops the benchmark if it fails.
measure() {
  local tool=$1 stage=$2 pair=$3 stdout=$4
  shift 4
  local base=$work/runs/$tool-$stage-$pair
  local rc=0
  "$timer" -f '%e %M %U %S' -o "$base.time" "$@" >"$stdout" 2>"$base.err" || rc=$?
  if (( rc != 0 )); then
    echo "run.sh: $tool $stage (pair $pair) exited with status $rc:" >&2
    tail -n 20 "$base.err" >&2
    exit 1
  fi
  read -r wall rss _ <"$base.time"
  printf 'run.sh: pair %d  %-5s %-5s %7ss  %7d KiB\n' "$pair" "$tool" "$stage" "$wall" "$rss" >&2
}

peer_env=(env OMP_NUM_THREADS=1 OPENBLAS_NUM_THREADS=1)
db=$work/chute.db
first_test=$corpus/$(head -n 1 "$corpus/route.txt")
for pair in $(seq 1 "$pairs"); do
  rm -f "$db" "$db-wal" "$db-shm" "$work/peer.pickle"
  "$chute" init --db "$db" >/dev/null
  measure chute learn "$pair" /dev/null \
    "$chute" learn --db "$db" --tree "$corpus/train"
  measure chute evaluate "$pair" "$work/chute-evaluate.txt" \
    "$chute" evaluate --db "$db" --folds 5
  measure peer learn "$pair" /dev/null \
    "${peer_env[@]}" "$py" "$here/peer_learn.py" "$corpus/learn.csv" "$work/peer.pickle"
  measure chute route "$pair" "$work/chute-route.jsonl" \
    "$chute" route --db "$db" "$corpus/test" --format jsonl
  measure peer route "$pair" "$work/peer-route.jsonl" \
    "${peer_env[@]}" "$py" "$here/peer_route.py" "$work/peer.pickle" "$corpus/test"
  measure chute startup "$pair" /dev/null \
    "$chute" route --db "$db" "$first_test" --format jsonl
  measure peer startup "$pair" /dev/null \
    "${peer_env[@]}" "$py" "$here/peer_route.py" "$work/peer.pickle" "$first_test"
  loads+=("after-pair-$pair" "$(load1)")
done

echo "run.sh: chute_microbench (about a minute)" >&2
"$micro" --benchmark_out="$out/microbench.json" --benchmark_out_format=json \
  --benchmark_min_time=0.2 --benchmark_repetitions=3 \
  --benchmark_report_aggregates_only=true >"$work/microbench.txt" 2>&1
loads+=(end "$(load1)")

"$py" "$here/summarize.py" --corpus "$corpus" --work "$work" --pairs "$pairs" \
  --microbench "$out/microbench.json" --out "$out/results.json" \
  --loads "${loads[@]}"
