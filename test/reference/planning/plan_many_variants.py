"""
Reference values for the Plan section's many-variant threshold (taskpane/logic/plan.ts, BONFERRONI_SPLIT).

With m challengers of equal size against one shared control, in the large-sample (normal) limit the m
test statistics are standard normal with pairwise correlation 1/2 (Dunnett, "A multiple comparison
procedure for comparing several treatments with a control", JASA 1955). For an overall one-sided
false-alarm rate of 5% this script prints, for m = 1 … 9:

- dunnett_z: Dunnett's exact one-sided critical value, the z with P(max Z_i < z) = 0.95 (scipy's
  multivariate normal CDF, solved with brentq);
- bonferroni_z: the Bonferroni critical value, norm.ppf(1 - 0.05/m);
- bonferroni_family: the overall false-alarm rate the Bonferroni split really gives,
  1 - P(max Z_i < bonferroni_z), which must be at most 0.05 (Bonferroni's inequality);
- R's power.prop.test(p1 = 0.10, p2 = 0.15, sig.level = 0.05/m, power = 0.8)$n for m = 1, 2, 4, 9
  (the classic size per variant at the split level), printed by plan_many_variants.R and pasted here:
  685.596858066, 830.391994689, 974.314770526, 1141.657597217.

Run: python3 test/reference/planning/plan_many_variants.py > test/reference/planning/plan_many_variants.json
"""
import json

from scipy.optimize import brentq
from scipy.stats import multivariate_normal, norm


def all_below(z, m):
    if m == 1:
        return norm.cdf(z)
    cov = [[1.0 if i == j else 0.5 for j in range(m)] for i in range(m)]
    return multivariate_normal(mean=[0.0] * m, cov=cov, abseps=1e-9, releps=1e-9, maxpts=2_000_000).cdf([z] * m)


rows = []
for m in range(1, 10):
    dunnett = brentq(lambda z: all_below(z, m) - 0.95, 1.0, 4.0, xtol=1e-10)
    bonferroni = norm.ppf(1 - 0.05 / m)
    rows.append({
        "challengers": m,
        "dunnett_z": round(dunnett, 6),
        "bonferroni_z": round(bonferroni, 6),
        "bonferroni_family": round(1 - all_below(bonferroni, m), 6),
    })

print(json.dumps({
    "source": "scipy.stats.multivariate_normal (equicorrelated 1/2), Dunnett 1955 setting; R power.prop.test for classic_n",
    "false_alarm": 0.05,
    "rows": rows,
    "classic_n": {"p1": 0.10, "p2": 0.15, "power": 0.8, "by_challengers": {"1": 685.596858066, "2": 830.391994689, "4": 974.314770526, "9": 1141.657597217}},
}, indent=2))
