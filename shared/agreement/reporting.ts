/** An ICC from fewer pairs of values than this is not reported: its interval spans nearly the whole scale. */
export const ICC_MIN_PAIRS = 5;

/** Why no ICC is given for `pairs` pairs of values, or null when there are enough. */
export function iccWithheldReason(pairs: number): string | null {
  if (pairs >= ICC_MIN_PAIRS) return null;
  return `Not computed: ${pairs} pair${pairs === 1 ? '' : 's'} of values; an ICC needs at least ${ICC_MIN_PAIRS}, since from fewer it is too unstable to mean anything.`;
}

/** κ = 1 (both coders agree on every item): its standard error is 0, which says nothing useful. */
export const isPerfectAgreement = (kappa: number | null) => kappa !== null && Math.abs(kappa - 1) < 1e-12;
