/**
 * Raised by every function in shared/stats on input it cannot use. The message names the offending
 * field and position (e.g. "variances[3] must be a positive finite number") so a form or an API
 * caller can point at it.
 */
export class StatsInputError extends Error {
  readonly code = 'invalid_stats_input';
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
    this.name = 'StatsInputError';
  }
}

/**
 * Input every check accepts whose arithmetic leaves double precision (1e308², 1/1e-320): an intermediate result
 * is ±∞ or NaN. The API answers 422; the message names the quantity that overflowed.
 */
export class StatsRangeError extends StatsInputError {
  constructor(quantity: string, field = 'effects') {
    super(`the values are too extreme to compute with: ${quantity} is not a finite number (an effect, its square or an inverse variance overflows double precision); rescale the effects or check the variances`, field);
    this.name = 'StatsRangeError';
  }
}

/** Throws StatsRangeError for the first of the named quantities that is not finite. */
export function assertFinite(values: Record<string, number>, field?: string): void {
  for (const [name, x] of Object.entries(values)) if (!Number.isFinite(x)) throw new StatsRangeError(name, field);
}
