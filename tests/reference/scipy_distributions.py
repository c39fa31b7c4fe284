"""scipy reference values for the t, chi-square and normal helpers (tests/reference/distributions.test.ts).

Tails come from scipy's cephes routines (stdtr, chdtrc, ndtr), which are accurate to ~1e-15 relative.
Quantiles are checked by a round trip through those tails, because scipy's own t quantile (stdtrit)
is only good to ~1e-9 here (e.g. t.isf(0.025, 1) = 12.706204736432 while tan(0.475π) = 12.706204736175).
Input: {"t": [[t, df]...], "t_q": [[q, alpha, df]...], "chi": [[x, df]...], "chi_q": [[x, p, df]...], "z": [z...], "z_q": [[z, alpha]...]}
"""
import json
import sys

from scipy import stats

req = json.load(sys.stdin)
print(json.dumps({
    "t": [2 * float(stats.t.sf(abs(t), df)) for t, df in req["t"]],
    "t_q": [float(stats.t.sf(q, df)) for q, _a, df in req["t_q"]],
    "chi": [float(stats.chi2.sf(x, df)) for x, df in req["chi"]],
    "chi_q": [float(stats.chi2.cdf(x, df)) for x, _p, df in req["chi_q"]],
    "z": [2 * float(stats.norm.sf(abs(z))) for z in req["z"]],
    "z_q": [float(stats.norm.sf(z)) for z, _a in req["z_q"]],
}))
