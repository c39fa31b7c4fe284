/**
 * What a computed effect estimates, as computeEffect reports it. Standardized mean differences are named by
 * their standardizer (Lakens 2013; Morris & DeShon 2002):
 * - g_s: independent groups, pooled SD of the groups
 * - g_av: within subject, average of the two condition variances, √((s1² + s2²)/2)
 * - g_rm: within subject, raw-score SD recovered from the SD of the differences and r, S_diff/√(2(1 − r))
 * - g_z: within subject, SD of the differences (not on the raw-score scale of the other three)
 * and the other metrics: log ratio of means, raw mean difference, raw mean, Fisher's z, log odds ratio.
 */
export const EFFECT_METRICS = ['g_s', 'g_av', 'g_rm', 'g_z', 'log_ratio', 'mean_diff', 'raw_mean', 'fisher_z', 'log_odds_ratio'] as const;
export type EffectMetric = (typeof EFFECT_METRICS)[number];
