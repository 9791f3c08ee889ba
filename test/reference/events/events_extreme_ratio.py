"""P(each is highest) of two event-rate variants at an extreme exposure ratio (the fuzzer's case
EVENTS_PROB_HIGHEST({0;1000000},{0.0431;999999999999},0.004), prior Gamma(0.004, 0)), by mpmath:
P(λ_B > λ_A) = I_z(a_A, a_B), z = b_A/(b_A + b_B), and P(λ_A > λ_B) = I_{1−z}(a_B, a_A), each with mpmath's
regularized betainc at 50 digits (their sum is printed as the self-check).

    python3 test/reference/events/events_extreme_ratio.py > test/reference/events/events_extreme_ratio.json
"""
import json

import mpmath
from mpmath import betainc, mp, mpf

mp.dps = 50
prior_shape = mpf('0.004')
events = [0, 1000000]
exposure = ['0.0431', '999999999999']
a = [prior_shape + e for e in events]
b = [mpf(x) for x in exposure]
p_b = betainc(a[0], a[1], 0, b[0] / (b[0] + b[1]), regularized=True)
p_a = betainc(a[1], a[0], 0, b[1] / (b[0] + b[1]), regularized=True)
print(json.dumps({
    'source': f'mpmath {mpmath.__version__} betainc at 50 digits: test/reference/events/events_extreme_ratio.py',
    'events': events,
    'exposure': [float(x) for x in exposure],
    'priorShape': 0.004,
    'probHighest': [float(p_a), float(p_b)],
    'checks': {'sumMinusOne': float(p_a + p_b - 1)},
}, indent=1))
