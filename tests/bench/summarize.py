#!/usr/bin/python3
"""Summarizes one run of tests/bench/run.sh: a table on standard output and
a JSON file. Standard library only.

    summarize.py --corpus DIR --work DIR --pairs N --microbench JSON
                 --out JSON --loads LABEL VALUE...

Reads WORK/runs/{chute,peer}-{learn,route,startup}-{1..N}.time and
WORK/runs/chute-evaluate-{1..N}.time (GNU time output
'%e %M %U %S': wall s, peak RSS KiB, user s, system s), CORPUS/corpus.json
(sizes), CORPUS/test.csv (true queues), WORK/{chute,peer}-route.jsonl (the
last pair's decisions) and the Google Benchmark JSON file.
"""

import argparse
import csv
import json
import os
import platform
import statistics
import sys

TOOLS = ("chute", "peer")
STAGES = ("learn", "route")
TARGET_SPEEDUP = 2.0  # chute must be at least this much faster than the peer
# 5-fold cross-validation (chute evaluate --folds 5) must cost less than
# this many learns of the same corpus.
EVALUATE_TARGET_LEARNS = 2.0


def read_time(path):
    with open(path, encoding="utf-8") as f:
        # GNU time prints a "Command exited with non-zero status" line first
        # when the command failed; run.sh stops before that, so the last line
        # holds the figures.
        fields = f.read().split("\n")
    line = [l for l in fields if l.strip()][-1].split()
    wall, rss_kib, user, system = (float(x) for x in line[:4])
    return {"wall_s": wall, "peak_rss_kib": int(rss_kib),
            "cpu_s": round(user + system, 2)}


def read_decisions(path):
    decisions = {}
    with open(path, encoding="utf-8") as f:
        for line in f:
            if line.strip():
                o = json.loads(line)
                decisions[os.path.normpath(o["file"])] = o["queue"]
    return decisions


def cpu_model():
    try:
        with open("/proc/cpuinfo", encoding="utf-8") as f:
            for line in f:
                if line.startswith("model name"):
                    return line.split(":", 1)[1].strip()
    except OSError:
        pass
    return platform.processor()


def microbench_summary(path):
    """Median aggregates of each benchmark, in plain units."""
    with open(path, encoding="utf-8") as f:
        data = json.load(f)
    rows = []
    for b in data.get("benchmarks", []):
        if b.get("run_type") == "aggregate" and b.get("aggregate_name") != "median":
            continue
        name = b.get("run_name", b["name"])
        row = {"name": name, "real_time": round(b["real_time"], 3),
               "time_unit": b.get("time_unit", "ns")}
        if "bytes_per_second" in b:
            row["mb_per_s"] = round(b["bytes_per_second"] / 1e6, 2)
        if "items_per_second" in b:
            row["items_per_s"] = round(b["items_per_second"], 1)
        if "terms_per_s" in b:
            row["terms_per_s"] = round(b["terms_per_s"], 0)
        rows.append(row)
    return {"context": {k: data.get("context", {}).get(k) for k in
                        ("date", "num_cpus", "mhz_per_cpu",
                         "library_build_type", "load_avg")},
            "benchmarks": rows}


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--corpus", required=True)
    ap.add_argument("--work", required=True)
    ap.add_argument("--pairs", type=int, required=True)
    ap.add_argument("--microbench", required=True)
    ap.add_argument("--out", required=True)
    ap.add_argument("--loads", nargs="*", default=[])
    args = ap.parse_args()

    with open(os.path.join(args.corpus, "corpus.json"), encoding="utf-8") as f:
        corpus = json.load(f)
    size = {"learn": corpus["train"], "route": corpus["test"]}

    def runs_of(tool, stage):
        return [read_time(os.path.join(args.work, "runs",
                                       "%s-%s-%d.time" % (tool, stage, i)))
                for i in range(1, args.pairs + 1)]

    results = {}
    for stage in STAGES:
        for tool in TOOLS:
            runs = runs_of(tool, stage)
            wall = statistics.median(r["wall_s"] for r in runs)
            rss = statistics.median(r["peak_rss_kib"] for r in runs)
            results.setdefault(stage, {})[tool] = {
                "runs": runs,
                "median_wall_s": wall,
                "min_wall_s": min(r["wall_s"] for r in runs),
                "max_wall_s": max(r["wall_s"] for r in runs),
                "median_cpu_s": statistics.median(r["cpu_s"] for r in runs),
                "median_peak_rss_mib": round(rss / 1024, 1),
                "mb_per_s": round(size[stage]["bytes"] / 1e6 / wall, 2),
                "documents_per_s": round(size[stage]["documents"] / wall, 1),
            }
        c, p = results[stage]["chute"], results[stage]["peer"]
        speedup = p["median_wall_s"] / c["median_wall_s"]
        results[stage]["ratio_chute_over_peer"] = {
            "throughput": round(speedup, 2),
            "peak_rss": round(c["median_peak_rss_mib"] /
                              p["median_peak_rss_mib"], 2),
            "target_throughput": TARGET_SPEEDUP,
            "target_met": speedup >= TARGET_SPEEDUP,
        }

    # Start-up: routing one document. Route throughput without it.
    for tool in TOOLS:
        runs = runs_of(tool, "startup")
        startup = statistics.median(r["wall_s"] for r in runs)
        net = results["route"][tool]["median_wall_s"] - startup
        results.setdefault("startup", {})[tool] = {
            "runs": runs,
            "median_wall_s": startup,
            "median_peak_rss_mib": round(
                statistics.median(r["peak_rss_kib"] for r in runs) / 1024, 1),
        }
        results.setdefault("route_without_startup", {})[tool] = {
            "wall_s": round(net, 2),
            "mb_per_s": round(size["route"]["bytes"] / 1e6 / net, 2)
                        if net > 0 else None,
            "documents_per_s": round(size["route"]["documents"] / net, 1)
                               if net > 0 else None,
        }
    c = results["route_without_startup"]["chute"]["wall_s"]
    p = results["route_without_startup"]["peer"]["wall_s"]
    results["route_without_startup"]["ratio_chute_over_peer"] = {
        "throughput": round(p / c, 2) if c > 0 else None}

    # chute evaluate --folds 5 against chute learn, in the same pairs.
    evaluate_runs = runs_of("chute", "evaluate")
    evaluate_wall = statistics.median(r["wall_s"] for r in evaluate_runs)
    learn_wall = results["learn"]["chute"]["median_wall_s"]
    results["evaluate"] = {
        "chute": {
            "runs": evaluate_runs,
            "median_wall_s": evaluate_wall,
            "min_wall_s": min(r["wall_s"] for r in evaluate_runs),
            "max_wall_s": max(r["wall_s"] for r in evaluate_runs),
            "median_cpu_s": statistics.median(r["cpu_s"] for r in evaluate_runs),
            "median_peak_rss_mib": round(statistics.median(
                r["peak_rss_kib"] for r in evaluate_runs) / 1024, 1),
        },
        "ratio_evaluate_over_learn": round(evaluate_wall / learn_wall, 3),
        "target_ratio_below": EVALUATE_TARGET_LEARNS,
        "target_met": evaluate_wall / learn_wall < EVALUATE_TARGET_LEARNS,
    }

    # Did both do the work? Decisions of the last pair against the truth.
    truth = {}
    with open(os.path.join(args.corpus, "test.csv"), newline="",
              encoding="utf-8") as f:
        for row in csv.DictReader(f):
            truth[os.path.normpath(os.path.join(args.corpus, row["path"]))] = \
                row["queue"]
    check = {}
    decided = {}
    for tool in TOOLS:
        d = read_decisions(os.path.join(args.work, "%s-route.jsonl" % tool))
        decided[tool] = d
        right = sum(1 for k, q in truth.items() if d.get(k) == q)
        check[tool] = {"documents_decided": len(d),
                       "missing": sum(1 for k in truth if k not in d),
                       "accuracy": round(right / len(truth), 4)}
    agree = sum(1 for k in truth
                if k in decided["chute"]
                and decided["chute"].get(k) == decided["peer"].get(k))
    check["agreement"] = round(agree / len(truth), 4)

    loads = dict(zip(args.loads[0::2], (float(x) for x in args.loads[1::2])))
    report = {
        "machine": {"cpus": os.cpu_count(), "cpu": cpu_model(),
                    "load_average_1min": loads},
        "corpus": corpus,
        "pairs": args.pairs,
        "results": results,
        "decisions_check": check,
        "microbench": microbench_summary(args.microbench),
    }
    os.makedirs(os.path.dirname(os.path.abspath(args.out)), exist_ok=True)
    with open(args.out, "w", encoding="utf-8") as f:
        json.dump(report, f, indent=2)
        f.write("\n")

    w = sys.stdout.write
    w("\nchute vs scikit-learn peer: medians of %d pairs; learn %d documents "
      "(%.1f MB), route %d documents (%.1f MB)\n" %
      (args.pairs, corpus["train"]["documents"],
       corpus["train"]["bytes"] / 1e6, corpus["test"]["documents"],
       corpus["test"]["bytes"] / 1e6))
    w("%-6s %-6s %9s %9s %8s %10s %13s %8s\n" %
      ("stage", "tool", "wall s", "(min-max)", "MB/s", "docs/s",
       "peak RSS MiB", "CPU s"))
    for stage in STAGES:
        for tool in TOOLS:
            r = results[stage][tool]
            w("%-6s %-6s %9.2f %9s %8.2f %10.1f %13.1f %8.2f\n" %
              (stage, tool, r["median_wall_s"],
               "%.1f-%.1f" % (r["min_wall_s"], r["max_wall_s"]),
               r["mb_per_s"], r["documents_per_s"], r["median_peak_rss_mib"],
               r["median_cpu_s"]))
    for tool in TOOLS:
        r = results["route_without_startup"][tool]
        w("%-6s %-6s %9.2f %9s %8.2f %10.1f %13s %8s   route less start-up\n" %
          ("net", tool, r["wall_s"], "", r["mb_per_s"] or 0,
           r["documents_per_s"] or 0, "", ""))
    for tool in TOOLS:
        r = results["startup"][tool]
        w("%-6s %-6s %9.2f %9s %8s %10s %13.1f %8s   route of 1 document\n" %
          ("start", tool, r["median_wall_s"], "", "", "",
           r["median_peak_rss_mib"], ""))
    for stage in STAGES:
        ratio = results[stage]["ratio_chute_over_peer"]
        w("%s: chute/peer throughput %.2fx (target >= %.0fx: %s), "
          "peak memory %.2fx\n" %
          (stage, ratio["throughput"], TARGET_SPEEDUP,
           "met" if ratio["target_met"] else "MISSED", ratio["peak_rss"]))
    ev = results["evaluate"]
    w("evaluate: chute evaluate --folds 5 %.2f s (%.1f-%.1f), peak %.1f MiB: "
      "%.2f learns of the corpus (target < %.0f: %s)\n" %
      (ev["chute"]["median_wall_s"], ev["chute"]["min_wall_s"],
       ev["chute"]["max_wall_s"], ev["chute"]["median_peak_rss_mib"],
       ev["ratio_evaluate_over_learn"], EVALUATE_TARGET_LEARNS,
       "met" if ev["target_met"] else "MISSED"))
    w("route less start-up: chute/peer throughput %.2fx\n" %
      (results["route_without_startup"]["ratio_chute_over_peer"]["throughput"]
       or 0))
    w("decisions (last pair): chute accuracy %.4f, peer accuracy %.4f, "
      "agreement %.4f; missing chute %d, peer %d\n" %
      (check["chute"]["accuracy"], check["peer"]["accuracy"],
       check["agreement"], check["chute"]["missing"],
       check["peer"]["missing"]))
    w("load average (1 min): %s\n" %
      ", ".join("%s %.2f" % kv for kv in loads.items()))
    w("\nchute_microbench (medians of 3 repetitions)\n")
    for b in report["microbench"]["benchmarks"]:
        extra = []
        if "mb_per_s" in b:
            extra.append("%.1f MB/s" % b["mb_per_s"])
        if "items_per_s" in b:
            extra.append("%.0f items/s" % b["items_per_s"])
        if "terms_per_s" in b:
            extra.append("%.3g terms/s" % b["terms_per_s"])
        w("  %-40s %12.1f %-2s  %s\n" % (b["name"], b["real_time"],
                                          b["time_unit"], ", ".join(extra)))
    w("\nwritten: %s\n" % args.out)
    return 0


if __name__ == "__main__":
    sys.exit(main())
