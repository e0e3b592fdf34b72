#!/usr/bin/env python3
"""Scores `chute route --format csv` output against an answer key.

usage: score_inbox.py KEY.csv ROUTED.csv

KEY.csv has the header path,queue with paths relative to its own folder;
ROUTED.csv is chute's CSV output (file,queue,confidence,...), with paths
relative to the current folder. Prints the accuracy and each miss.
Standard library only.
"""
import csv
import os
import sys


def main():
    key_path, routed_path = sys.argv[1], sys.argv[2]
    base = os.path.dirname(os.path.abspath(key_path))
    with open(key_path, newline="", encoding="utf-8") as f:
        truth = {os.path.normpath(os.path.join(base, r["path"])): r["queue"]
                 for r in csv.DictReader(f)}
    with open(routed_path, newline="", encoding="utf-8") as f:
        routed = [(os.path.normpath(os.path.abspath(r["file"])), r["queue"],
                   float(r["confidence"])) for r in csv.DictReader(f)]
    right, scored, misses = 0, 0, []
    for path, queue, confidence in routed:
        if path not in truth:
            continue
        scored += 1
        if truth[path] == queue:
            right += 1
        else:
            misses.append((os.path.relpath(path), truth[path], queue, confidence))
    if scored == 0:
        sys.exit("score_inbox: no routed file is in the answer key")
    print(f"{right} of {scored} documents routed to the right queue: "
          f"accuracy {right / scored:.3f}")
    for path, want, got, confidence in misses:
        print(f"  missed {path}: routed to {got} (confidence {confidence:.3f}), "
              f"belongs in {want}")
    unrouted = len(truth) - scored
    if unrouted:
        print(f"  {unrouted} documents of the key were not routed")


if __name__ == "__main__":
    main()
