"""Reference check of VISITORS_NEEDED(0.1, 0.2) (threshold 0.95, power 0.8, uniform prior): the exact
decision power (scipy, same definition as addin_values.py: binomial outcomes summed, Beta posteriors
integrated with quad) on both sides of the answer.
Run with  python3 test/reference/addin/addin_visitors_needed.py > test/reference/addin/addin_visitors_needed.json
"""
import json

from addin_values import decision_power

cases = []
for n in (3023, 3024):
    cases.append({"baseline": 0.10, "lift": 0.20, "n": n, "threshold": 0.95, "power": decision_power(0.10, 0.20, n, 0.95)})
print(json.dumps({"source": "scipy 1.17; made by addin_visitors_needed.py", "cases": cases}, indent=1))
