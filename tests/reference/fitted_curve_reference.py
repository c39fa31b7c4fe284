"""Reference values for tests/reference/fitted-curve.test.ts: statsmodels GLM (Binomial, probit and logit links on
(1, x), (k, n - k) as the response) fitted to each set and its predicted probabilities on a grid of levels.

Reads {"sets": [{"x", "n", "k", "grid"}]} on stdin; prints {"statsmodels": version, "sets": [{"probit": [...], "logit": [...]}]}.
"""
import json
import sys
import warnings

import numpy as np
import statsmodels
import statsmodels.api as sm

warnings.simplefilter("ignore")


def predicted(x, n, k, grid, link):
    endog = np.column_stack([k, n - k])
    family = sm.families.Binomial(link=sm.families.links.probit() if link == "probit" else sm.families.links.logit())
    r = sm.GLM(endog, sm.add_constant(x, has_constant="add"), family=family).fit(tol=1e-14, tol_criterion="params", maxiter=500)
    return [float(p) for p in r.predict(sm.add_constant(grid, has_constant="add"))]


data = json.load(sys.stdin)
out = []
for s in data["sets"]:
    x, n, k, grid = (np.asarray(s[f], dtype=float) for f in ("x", "n", "k", "grid"))
    out.append({"probit": predicted(x, n, k, grid, "probit"), "logit": predicted(x, n, k, grid, "logit")})
json.dump({"statsmodels": statsmodels.__version__, "sets": out}, sys.stdout)
