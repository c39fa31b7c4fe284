"""Reference values for tests/reference/psychophysics.test.ts, from Debian's python3-statsmodels and scipy.

Reads {"glm": [...], "lapse": [...], "simultaneity": [...]} on stdin (each item {"x", "n", "k"}, lapse items also
"model", "guess", "fit_lapse") and prints, per item:

- glm: statsmodels GLM, Binomial family, probit and logit links on (1, x) with (k, n - k) as the response,
  iterated to a parameter tolerance of 1e-14 so its covariance (expected information, IRLS weights) is taken at
  the optimum; pse = -a/b, spread = 1/b, their SEs by the delta method from the GLM covariance.
- lapse: p = guess + (1 - guess - lam) F(a + b x), lam in [0, 0.1] (or fixed at 0), maximised by
  scipy.optimize.minimize (L-BFGS-B, analytic gradient) from a grid of starts, then polished by solving
  score = 0 over the parameters not at a bound with scipy.optimize.root. SEs from the expected information with
  the parameters at a bound held fixed.
- simultaneity: p = A exp(-(x - mu)^2 / (2 sigma^2)), A in (0, 1], the same way; the Jacobian of p for the
  expected information by complex-step differentiation (statsmodels.tools.numdiff.approx_fprime_cs).
- tails: the normal upper tail Q(z) = erfc(z / sqrt 2) / 2 to 40 digits with mpmath (Debian python3-mpmath),
  for the probit's own tail function.
loglik includes the binomial coefficients; deviance is against one probability per row.
"""
import json
import math
import sys
import warnings

import mpmath
import numpy as np
import scipy
from scipy import optimize, special, stats
import statsmodels
import statsmodels.api as sm
from statsmodels.tools.numdiff import approx_fprime_cs

warnings.simplefilter("ignore")
LAPSE_MAX = 0.1


def log_choose(n, k):
    return float(np.sum(special.gammaln(n + 1) - special.gammaln(k + 1) - special.gammaln(n - k + 1)))


def binom_ll(n, k, p, q):
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.where(k > 0, k * np.log(p), 0.0) + np.where(n - k > 0, (n - k) * np.log(q), 0.0)
    return float(np.sum(t)) + log_choose(n, k)


def deviance(n, k, p, q):
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.where(k > 0, k * np.log(k / (n * p)), 0.0) + np.where(n - k > 0, (n - k) * np.log((n - k) / (n * q)), 0.0)
    return float(2 * np.sum(t))


def glm_fit(x, n, k, link):
    endog = np.column_stack([k, n - k])
    exog = sm.add_constant(x, has_constant="add")
    family = sm.families.Binomial(link=sm.families.links.probit() if link == "probit" else sm.families.links.logit())
    r = sm.GLM(endog, exog, family=family).fit(tol=1e-14, tol_criterion="params", maxiter=500)
    a, b = (float(v) for v in r.params)
    cov = np.asarray(r.cov_params())
    g_pse = np.array([-1 / b, a / b**2])
    g_spread = np.array([0.0, -1 / b**2])
    spread = 1 / b
    return {
        "pse": -a / b,
        "spread": spread,
        "se_pse": float(math.sqrt(g_pse @ cov @ g_pse)),
        "se_spread": float(math.sqrt(g_spread @ cov @ g_spread)),
        "jnd": spread * (float(stats.norm.ppf(0.75)) if link == "probit" else math.log(3)),
        "deviance": float(r.deviance),
        "loglik": float(r.llf),
        "df": float(r.df_resid),
        "converged": bool(r.converged),
    }


def cdf_parts(model, eta):
    """F(eta), 1 - F(eta) = F(-eta), and the density."""
    if model == "cumulative_gaussian":
        return special.ndtr(eta), special.ndtr(-eta), stats.norm.pdf(eta)
    F = special.expit(eta)
    Q = special.expit(-eta)
    return F, Q, F * Q


def polish(theta, free, grad):
    """Solve grad(theta)[free] = 0 over the free coordinates, starting from theta."""
    idx = np.flatnonzero(free)
    if len(idx) == 0:
        return theta

    def g(z):
        t = theta.copy()
        t[idx] = z
        return grad(t)[idx]

    sol = optimize.root(g, theta[idx], method="hybr", options={"xtol": 1e-15})
    out = theta.copy()
    out[idx] = sol.x
    return out


def bounded_max(negll, neggrad, starts, bounds):
    best = None
    for s in starts:
        r = optimize.minimize(negll, s, jac=neggrad, method="L-BFGS-B", bounds=bounds,
                              options={"ftol": 1e-15, "gtol": 1e-11, "maxiter": 20000, "maxfun": 40000})
        r = optimize.minimize(negll, r.x, jac=neggrad, method="L-BFGS-B", bounds=bounds,
                              options={"ftol": 1e-15, "gtol": 1e-11, "maxiter": 20000, "maxfun": 40000})
        if np.isfinite(r.fun) and (best is None or r.fun < best.fun):
            best = r
    theta = np.array(best.x, dtype=float)
    # parameters at a bound with the gradient pointing out of the feasible region are held there
    g = -neggrad(theta)
    free = np.ones(len(theta), dtype=bool)
    for i, (lo, hi) in enumerate(bounds):
        if lo is not None and theta[i] - lo < 1e-8 and g[i] <= 0:
            theta[i] = lo
            free[i] = False
        if hi is not None and hi - theta[i] < 1e-8 and g[i] >= 0:
            theta[i] = hi
            free[i] = False
    polished = polish(theta, free, lambda t: -neggrad(t))
    inside = all((lo is None or v >= lo) and (hi is None or v <= hi) for v, (lo, hi) in zip(polished, bounds))
    if inside and np.isfinite(negll(polished)) and negll(polished) <= negll(theta) + 1e-9 * abs(negll(theta)):
        theta = polished
    return theta, free, float(best.fun)


def lapse_fit(item):
    x = np.array(item["x"], float)
    n = np.array(item["n"], float)
    k = np.array(item["k"], float)
    model = item["model"]
    guess = float(item["guess"])
    fit_lapse = bool(item["fit_lapse"])
    mean, sd = float(np.mean(x)), float(np.std(x))
    u = (x - mean) / sd

    def parts(t):
        a, b = t[0], t[1]
        lam = t[2] if fit_lapse else 0.0
        c = 1 - guess - lam
        F, Q, f = cdf_parts(model, a + b * u)
        p = guess + c * F
        q = c * Q + lam
        dp = np.vstack([c * f, c * f * u] + ([-F] if fit_lapse else []))
        return p, q, dp

    def negll(t):
        p, q, _ = parts(t)
        with np.errstate(divide="ignore", invalid="ignore"):
            v = -np.sum(np.where(k > 0, k * np.log(p), 0.0) + np.where(n - k > 0, (n - k) * np.log(q), 0.0))
        return float(v) if np.isfinite(v) else 1e300

    def neggrad(t):
        p, q, dp = parts(t)
        r = np.where(k > 0, k / p, 0.0) - np.where(n - k > 0, (n - k) / q, 0.0)
        return -(dp @ r)

    glm = glm_fit(u, n, k, "probit" if model == "cumulative_gaussian" else "logit")
    a0, b0 = -glm["pse"] / glm["spread"], 1 / glm["spread"]
    starts = []
    for scale in (1.0, 0.7, 1.4):
        for lam in ((0.0, 0.02, 0.05, 0.09) if fit_lapse else (None,)):
            starts.append([a0 * scale, b0 * scale] + ([lam] if fit_lapse else []))
    bounds = [(None, None), (None, None)] + ([(0.0, LAPSE_MAX)] if fit_lapse else [])
    theta, free, lbfgs_negll = bounded_max(negll, neggrad, starts, bounds)
    a, b = theta[0], theta[1]
    p, q, dp = parts(theta)
    info = (dp * (n / (p * q))) @ dp.T
    idx = np.flatnonzero(free)
    cov = np.zeros_like(info)
    cov[np.ix_(idx, idx)] = np.linalg.inv(info[np.ix_(idx, idx)])
    # pse and spread on the x axis: x = mean + sd u
    g_pse = np.zeros(len(theta))
    g_pse[0], g_pse[1] = -sd / b, sd * a / b**2
    g_spread = np.zeros(len(theta))
    g_spread[1] = -sd / b**2
    return {
        "pse": mean - sd * a / b,
        "spread": sd / b,
        "lapse": float(theta[2]) if fit_lapse else 0.0,
        "lapse_at_bound": bool(fit_lapse and not free[2]),
        "se_pse": float(math.sqrt(g_pse @ cov @ g_pse)),
        "se_spread": float(math.sqrt(g_spread @ cov @ g_spread)),
        "loglik": binom_ll(n, k, p, q),
        "loglik_lbfgsb": -lbfgs_negll + log_choose(n, k),
        "deviance": deviance(n, k, p, q),
    }


def simultaneity_fit(item):
    x = np.array(item["x"], float)
    n = np.array(item["n"], float)
    k = np.array(item["k"], float)
    mean, sd = float(np.mean(x)), float(np.std(x))
    u = (x - mean) / sd

    def prob(t, uu=u):
        mu, sigma, A = t
        z = (uu - mu) / sigma
        return A * np.exp(-0.5 * z * z)

    def negll(t):
        p = prob(t)
        q = 1 - p
        with np.errstate(divide="ignore", invalid="ignore"):
            v = -np.sum(np.where(k > 0, k * np.log(p), 0.0) + np.where(n - k > 0, (n - k) * np.log(q), 0.0))
        return float(v) if np.isfinite(v) else 1e300

    def neggrad(t):
        mu, sigma, A = t
        z = (u - mu) / sigma
        G = np.exp(-0.5 * z * z)
        p = A * G
        q = 1 - p
        dp = np.vstack([p * z / sigma, p * z * z / sigma, G])
        r = np.where(k > 0, k / p, 0.0) - np.where(n - k > 0, (n - k) / q, 0.0)
        return -(dp @ r)

    props = k / n
    starts = []
    for mu in (float(np.sum(props * u) / np.sum(props)), float(u[np.argmax(props)]), 0.0):
        for sigma in (0.3, 0.7, 1.5):
            for A in (0.6, 0.95):
                starts.append([mu, sigma, A])
    bounds = [(None, None), (1e-6, None), (1e-9, 1.0)]
    theta, free, lbfgs_negll = bounded_max(negll, neggrad, starts, bounds)
    # everything on the x axis: x = mean + sd u
    tx = np.array([mean + sd * theta[0], sd * theta[1], theta[2]])

    def prob_x(t):
        mu, sigma, A = t
        z = (x - mu) / sigma
        return A * np.exp(-0.5 * z * z)

    p = prob_x(tx)
    q = 1 - p
    J = approx_fprime_cs(tx, prob_x)  # rows: levels, columns: mu, sigma, A
    info = (J.T * (n / (p * q))) @ J
    idx = np.flatnonzero(free)
    cov = np.zeros_like(info)
    cov[np.ix_(idx, idx)] = np.linalg.inv(info[np.ix_(idx, idx)])
    A = float(tx[2])
    width = None
    se_width = None
    if A >= 0.5:
        def wfun(t):
            return 2 * t[1] * np.sqrt(2 * np.log(2 * t[2]))
        width = float(wfun(tx))
        gw = approx_fprime_cs(tx, wfun)
        se_width = float(math.sqrt(gw @ cov @ gw))
    return {
        "centre": float(tx[0]),
        "sigma": float(tx[1]),
        "amplitude": A,
        "amplitude_at_bound": bool(not free[2]),
        "width": width,
        "se_centre": float(math.sqrt(cov[0, 0])),
        "se_width": se_width,
        "loglik": binom_ll(n, k, p, q),
        "loglik_lbfgsb": -lbfgs_negll + log_choose(n, k),
        "deviance": deviance(n, k, p, q),
    }


def main():
    spec = json.load(sys.stdin)
    out = {"versions": {"statsmodels": statsmodels.__version__, "scipy": scipy.__version__, "mpmath": mpmath.__version__}, "glm": [], "lapse": [], "simultaneity": []}
    for item in spec.get("glm", []):
        x, n, k = (np.array(item[f], float) for f in ("x", "n", "k"))
        out["glm"].append({"probit": glm_fit(x, n, k, "probit"), "logit": glm_fit(x, n, k, "logit")})
    for item in spec.get("lapse", []):
        out["lapse"].append(lapse_fit(item))
    for item in spec.get("simultaneity", []):
        out["simultaneity"].append(simultaneity_fit(item))
    mpmath.mp.dps = 40
    out["tails"] = [float(mpmath.erfc(mpmath.mpf(z) / mpmath.sqrt(2)) / 2) for z in spec.get("tails", [])]
    print(json.dumps(out))


if __name__ == "__main__":
    main()
