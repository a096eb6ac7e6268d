#!/usr/bin/python3
"""Wilson score intervals from SciPy (Debian python3-scipy).

Reads JSON [[k, n], ...] and prints [[low, high], ...] at 95 % confidence,
from scipy.stats.binomtest(k, n).proportion_ci(method="wilson").
"""
import json
import sys

from scipy.stats import binomtest

pairs = json.load(open(sys.argv[1], encoding="utf-8"))
out = []
for k, n in pairs:
    ci = binomtest(k, n).proportion_ci(confidence_level=0.95, method="wilson")
    out.append([float(ci.low), float(ci.high)])
json.dump(out, sys.stdout)
