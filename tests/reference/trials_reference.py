"""Independent check of an effect from trial data: each participant x condition fitted with statsmodels'
binomial GLM (probit link on (1, x)), PSE = -a/b, then numpy's mean and SD (ddof 1) of the paired
differences A - B and Pearson's r between the conditions (np.corrcoef). Input on stdin, JSON out."""
import json
import sys

import numpy as np
import statsmodels.api as sm

data = json.load(sys.stdin)
link = sm.families.links.probit() if data.get("model", "probit") == "probit" else sm.families.links.logit()
pse = {}
for cell in data["cells"]:
    x = np.asarray(cell["x"], dtype=float)
    n = np.asarray(cell["n"], dtype=float)
    k = np.asarray(cell["k"], dtype=float)
    X = sm.add_constant(x)
    res = sm.GLM(np.column_stack([k, n - k]), X, family=sm.families.Binomial(link=link)).fit(tol=1e-12, maxiter=200)
    a, b = res.params
    pse.setdefault(cell["participant"], {})[cell["condition"]] = -a / b

A, B = data["conditionA"], data["conditionB"]
people = sorted(p for p in pse if A in pse[p] and B in pse[p])
va = np.array([pse[p][A] for p in people])
vb = np.array([pse[p][B] for p in people])
d = va - vb
out = {
    "n": len(people),
    "mean_diff": float(d.mean()),
    "sd_diff": float(d.std(ddof=1)),
    "r": float(np.corrcoef(va, vb)[0, 1]),
    "mean1": float(va.mean()),
    "mean2": float(vb.mean()),
    "variance": float(d.var(ddof=1) / len(people)),
    "pse": {p: pse[p] for p in people},
}
json.dump(out, sys.stdout)
