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
