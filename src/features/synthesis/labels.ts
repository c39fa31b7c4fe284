export { valueLabel } from '../../../shared/synthesis/labels';

/** Fixed precision by metric: milliseconds to 1 decimal, standardized metrics to 3. */
export const digitsFor = (metric: string) => (metric === 'raw_mean' || metric === 'mean_diff' ? 1 : 3);
export const fx = (x: number | null | undefined, d: number) => (x == null || !Number.isFinite(x) ? '—' : x.toFixed(d));
export const fp = (p: number | null | undefined) => (p == null || !Number.isFinite(p) ? '—' : p < 0.001 ? '< 0.001' : p.toFixed(3));
/** "p = 0.042" or "p < 0.001" */
export const pEq = (p: number | null | undefined) => (p != null && Number.isFinite(p) && p < 0.001 ? 'p < 0.001' : `p = ${fp(p)}`);
