#!/usr/bin/python3
"""Checks chute's Wilson score interval against statsmodels.

Reference: statsmodels.stats.proportion.proportion_confint(count, nobs,
alpha=0.05, method='wilson') (Debian package python3-statsmodels), which
implements E. B. Wilson, "Probable inference, the law of succession, and
statistical inference", JASA 22(158), 1927. chute's interval is
classify/wilson_interval.h, printed by the helper tests/reference/wilson_print.

Usage: wilson_statsmodels.py PATH_TO_wilson_print
"""
import random
import subprocess
import sys

from statsmodels.stats.proportion import proportion_confint


def main():
    rng = random.Random(20261202)  # seeded: the same pairs every run
    pairs = [(0, 1), (1, 1), (0, 2), (1, 2), (47, 50), (81, 263), (0, 20)]
    for _ in range(500):
        n = rng.choice([rng.randint(1, 30), rng.randint(1, 1000), rng.randint(1, 10**7)])
        pairs.append((rng.randint(0, n), n))
    text = "".join(f"{k} {n}\n" for k, n in pairs)
    out = subprocess.run([sys.argv[1]], input=text, capture_output=True, text=True,
                         check=True).stdout.split("\n")
    worst = 0.0
    for (k, n), line in zip(pairs, out):
        fields = line.split()
        low, high = float(fields[2]), float(fields[3])
        ref_low, ref_high = proportion_confint(k, n, alpha=0.05, method="wilson")
        err = max(abs(low - ref_low), abs(high - ref_high))
        worst = max(worst, err)
        if err > 1e-12:
            print(f"FAIL {k}/{n}: chute {low!r} {high!r}, statsmodels {ref_low!r} {ref_high!r}")
            return 1
    print(f"{len(pairs)} intervals agree with statsmodels; largest difference {worst:.3g}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
