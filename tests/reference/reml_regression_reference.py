"""REML residual tau2 of a meta-regression (design [1, x]) by direct numerical maximization of the
restricted likelihood with scipy (bounded Brent on [0, upper], xatol 1e-13), plus the WLS coefficients and
SEs at that tau2 and the intercept-only REML tau2 the same way. Input {"effects", "variances", "moderator"}."""
import json
import sys

import numpy as np
from scipy import optimize

req = json.load(sys.stdin)
y = np.asarray(req["effects"], float)
v = np.asarray(req["variances"], float)
x = np.asarray(req["moderator"], float)


def fit(X, t):
    w = 1 / (v + t)
    A = X.T @ (X * w[:, None])
    b = np.linalg.solve(A, X.T @ (w * y))
    e = y - X @ b
    ll = 0.5 * np.sum(np.log(w)) - 0.5 * np.linalg.slogdet(A)[1] - 0.5 * np.sum(w * e * e)
    return ll, b, np.sqrt(np.diag(np.linalg.inv(A)))


def reml(X):
    upper = 10 * (np.var(y) + np.max(v))
    r = optimize.minimize_scalar(lambda t: -fit(X, t)[0], bounds=(0, upper), method="bounded", options={"xatol": 1e-13})
    return float(r.x) if -r.fun > fit(X, 0.0)[0] else 0.0


X = np.column_stack([np.ones(len(y)), x])
t = reml(X)
_, b, se = fit(X, t)
print(json.dumps({"tau2": t, "beta": b.tolist(), "se": se.tolist(), "tau2_total": reml(np.ones((len(y), 1)))}))
