"""Reference values for tests/reference/statsmodels.test.ts, from Debian's python3-statsmodels and scipy.

Reads {"datasets": [{"effects": [...], "variances": [...]}], "level": 0.95} on stdin and prints, per data set,
what statsmodels.stats.meta_analysis.combine_effects reports for fixed effect, DerSimonian-Laird and
Paule-Mandel (with and without its HKSJ variance), plus independent scipy/statsmodels values for the parts
combine_effects does not cover (Q-profile interval, REML, Egger's regression, Begg's Kendall tau).

Two known traits of statsmodels 0.13.5 are handled explicitly, not by tolerances:
- its DL tau2 is not clipped at 0: when it is negative the random-effects quantities are recomputed by
  combine_effects itself at tau2 = 0 (tau2_start=0, maxiter=0 skips its iteration);
- its PM iteration returns tau2 = 0 when rounding makes the estimating equation slightly negative near the
  root ("collapse"): the exact root of Q(tau2) = k - 1 from scipy.optimize.brentq is used instead, and all
  PM quantities are recomputed by combine_effects at that tau2.
"""
import json
import math
import sys
import warnings

import numpy as np
from scipy import optimize, stats
import statsmodels.api as smapi
from statsmodels.stats.meta_analysis import combine_effects


def gen_q(y, v, tau2):
    """Generalized Q with a centred two-pass sum (math.fsum), accurate where the one-pass form cancels."""
    if np.ptp(y) == 0:
        return 0.0  # identical effects: every residual is exactly 0
    w = 1.0 / (v + tau2)
    m = math.fsum(w * y) / math.fsum(w)
    return math.fsum(w * (y - m) ** 2)


def q_root(y, v, target):
    """tau2 >= 0 with gen_q(tau2) = target (0 when gen_q(0) <= target), by brentq to full precision."""
    if gen_q(y, v, 0.0) <= target:
        return 0.0
    hi = max(float(np.var(y)), float(np.max(v)), 1e-300)
    while gen_q(y, v, hi) > target:
        hi *= 2.0
    return optimize.brentq(lambda t: gen_q(y, v, t) - target, 0.0, hi, xtol=1e-300, rtol=4 * np.finfo(float).eps, maxiter=1000)


def reml_ll(y, v, tau2):
    w = 1.0 / (v + tau2)
    m = math.fsum(w * y) / math.fsum(w)
    return 0.5 * math.fsum(np.log(w)) - 0.5 * math.log(math.fsum(w)) - 0.5 * math.fsum(w * (y - m) ** 2)


def reml_score(y, v, tau2):
    w = 1.0 / (v + tau2)
    sw = math.fsum(w)
    m = math.fsum(w * y) / sw
    trp = sw - math.fsum(w * w) / sw
    return -0.5 * trp + 0.5 * math.fsum(w * w * (y - m) ** 2)


def reml_tau2(y, v):
    """Global maximum of the restricted likelihood over tau2 >= 0: every sign change of the score on a
    log grid is refined by brentq, and the likelihood there is compared with its value at 0."""
    best_t, best_ll = 0.0, reml_ll(y, v, 0.0)
    top = max(float(np.var(y)) * 10 + float(np.max(v)) * 10, 1e-12)
    grid = np.concatenate([[0.0], np.geomspace(top * 1e-14, top, 400)])
    s = [reml_score(y, v, t) for t in grid]
    for a, b, sa, sb in zip(grid[:-1], grid[1:], s[:-1], s[1:]):
        if sa > 0 and sb <= 0:
            r = optimize.brentq(lambda t: reml_score(y, v, t), a, b, xtol=1e-300, rtol=4 * np.finfo(float).eps, maxiter=1000)
            ll = reml_ll(y, v, r)
            if ll > best_ll:
                best_t, best_ll = r, ll
    return best_t


def re_summary(res, level, hksj):
    """Pooled random-effects figures from a CombineResults object."""
    alpha = 1 - level
    ci = res.conf_int(alpha=alpha, use_t=hksj)
    if hksj:
        se = float(res.sd_eff_w_re_hksj)
        lo, hi = ci[3]
    else:
        se = float(res.sd_eff_w_re)
        lo, hi = ci[1]
    return {"estimate": float(res.mean_effect_re), "se": se, "ci_lower": float(lo), "ci_upper": float(hi)}


def fe_summary(res, level, hksj):
    alpha = 1 - level
    ci = res.conf_int(alpha=alpha, use_t=hksj)
    if hksj:
        se = float(res.sd_eff_w_fe_hksj)
        lo, hi = ci[2]
    else:
        se = float(res.sd_eff_w_fe)
        lo, hi = ci[0]
    return {"estimate": float(res.mean_effect_fe), "se": se, "ci_lower": float(lo), "ci_upper": float(hi)}


def one(ds, level):
    y = np.asarray(ds["effects"], dtype=float)
    v = np.asarray(ds["variances"], dtype=float)
    k = len(y)
    alpha = 1 - level
    out = {"k": k}

    dl = combine_effects(y, v, method_re="chi2", alpha=alpha)
    # statsmodels forms Q in one pass (sum w·y² − (sum w·y)²/sum w), which leaves a rounding residue
    # (~1e-15 for identical effects, ~1e-10 relative with tiny variances, magnified about Q/2 times in the
    # chi-square tail); Q, H2, I2 and Q_p are therefore taken from the two-pass fsum Q, and statsmodels' own
    # q is reported beside it so the test can check the two agree wherever Q is not 0.
    q = gen_q(y, v, 0.0)
    out["Q_statsmodels"] = float(dl.q)
    out["Q"] = q
    out["Q_p"] = float(stats.chi2.sf(q, k - 1))
    out["H2"] = q / (k - 1)
    out["H2_statsmodels"] = float(dl.h2)
    out["I2"] = 100 * max(0.0, (q - (k - 1)) / q) if q > 0 else 0.0
    out["dl_tau2_unclipped"] = float(dl.tau2)
    out["FE"] = {str(h).lower(): fe_summary(dl, level, h) for h in (False, True)}

    if dl.tau2 < 0:
        dl_used = combine_effects(y, v, method_re="iterated", alpha=alpha, tau2_start=0.0, maxiter=0)
        out["dl_clipped"] = True
    else:
        dl_used = dl
        out["dl_clipped"] = False
    out["DL"] = {str(h).lower(): re_summary(dl_used, level, h) for h in (False, True)}
    out["DL_tau2"] = max(0.0, float(dl.tau2))

    pm = combine_effects(y, v, method_re="iterated", alpha=alpha, atol=1e-12, maxiter=500)
    root = q_root(y, v, k - 1)
    collapsed = bool(pm.tau2 == 0 and gen_q(y, v, 0.0) > k - 1)
    out["pm_collapsed"] = collapsed
    out["pm_statsmodels_tau2"] = float(pm.tau2)
    out["PM_tau2"] = root if collapsed else float(pm.tau2)
    out["PM_tau2_brentq"] = root
    pm_used = combine_effects(y, v, method_re="iterated", alpha=alpha, tau2_start=out["PM_tau2"], maxiter=0)
    out["PM"] = {str(h).lower(): re_summary(pm_used, level, h) for h in (False, True)}

    # Q-profile interval (Viechtbauer 2007) by brentq on the accurate generalized Q
    if k >= 2:
        out["tau2_ci"] = [q_root(y, v, stats.chi2.isf(alpha / 2, k - 1)), q_root(y, v, stats.chi2.ppf(alpha / 2, k - 1))]
    out["REML_tau2"] = reml_tau2(y, v)
    out["prediction_t"] = float(stats.t.isf(alpha / 2, k - 2)) if k >= 3 else None

    if k >= 3 and np.ptp(v) > 0 and np.ptp(y) > 0:
        x = 1 / np.sqrt(v)
        fit = smapi.OLS(y / np.sqrt(v), smapi.add_constant(x)).fit()
        out["egger"] = {"intercept": float(fit.params[0]), "se": float(fit.bse[0]), "t": float(fit.tvalues[0]), "p": float(fit.pvalues[0])}
        m = float(dl.mean_effect_fe)
        ts = (y - m) / np.sqrt(v - 1 / np.sum(1 / v))
        tau, p = stats.kendalltau(ts, v, variant="b", method="asymptotic")
        ties = len(np.unique(ts)) < k or len(np.unique(v)) < k
        p_exact = None if ties else float(stats.kendalltau(ts, v, method="exact").pvalue)
        out["begg"] = {"tau": float(tau), "p": float(p), "p_exact": p_exact}
    else:
        out["egger"] = None
    return out


def main():
    # statsmodels divides by v + tau2 with its unclipped negative DL tau2; those warnings are expected
    warnings.simplefilter("ignore")
    np.seterr(all="ignore")
    req = json.load(sys.stdin)
    level = req.get("level", 0.95)
    print(json.dumps({"statsmodels": __import__("statsmodels").__version__, "results": [one(d, level) for d in req["datasets"]]}))


if __name__ == "__main__":
    main()
