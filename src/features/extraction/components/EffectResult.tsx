import { GZ_ADVICE, REPORT_FORM_LABELS, type ComputeAttempt } from '../../../../shared/extraction/compute';
import type { Warning } from '../../../../shared/extraction/warnings';
import { METRIC_LABELS } from '../../../../shared/vocabulary/outcomes';
import type { Metric } from '../../../../shared/stats/metrics';
import { fixed } from '../../../lib/format';

/** The live result of one effect: value, variance, SE, the formula and its source, and any plausibility checks. */
export function EffectResult({ attempt, warnings, form }: { attempt: ComputeAttempt | null; warnings: Warning[]; form?: keyof typeof REPORT_FORM_LABELS }) {
  return (
    <div className="mt-2 rounded border border-paper-edge bg-white/70 px-3 py-2 text-sm" aria-live="polite" data-testid="effect-result">
      {!form && <p className="text-ink-faint">Choose how the result was reported to compute the effect size.</p>}
      {form && attempt && !attempt.ok && (
        <p className="text-ink-soft">
          <span aria-hidden>…</span> Not computable yet: {attempt.error}
        </p>
      )}
      {attempt?.ok && attempt.result && (
        <>
          <p className="tabular-nums">
            <strong>✓ {METRIC_LABELS[attempt.result.metric as Metric]}</strong> ={' '}
            <strong data-testid="computed-effect">{fixed(attempt.result.effect, 3)}</strong>, variance {fixed(attempt.result.variance, 4)}, SE{' '}
            {fixed(Math.sqrt(attempt.result.variance), 3)}
            {attempt.result.n != null && <> · n = {attempt.result.n}</>}
            {attempt.result.assumedR != null && (
              <span className="ml-1 text-caution-dark">
                · ⚠ assumes r = {attempt.result.assumedR} between conditions (not reported)
              </span>
            )}
          </p>
          {attempt.result.signReversed && (
            <p className="mt-1 text-xs text-ink-soft" data-testid="sign-reversed">
              ⇄ The sheet reversed the sign: {attempt.result.signReason}. The reported values are kept as entered.
            </p>
          )}
          {attempt.result.fromBound && (
            <p className="mt-1 text-xs text-caution-dark" data-testid="bound-flag">
              ⚠ Computed from a bound (p below the value given): the effect is at least this far from 0. A reviewer may leave such effects out.
            </p>
          )}
          {attempt.result.approximate && (
            <p className="mt-1 text-xs text-caution-dark" data-testid="approximate-flag">
              ⚠ Approximate: the mean and SD were estimated from the median with quartiles or range (Wan et al. 2014). A reviewer may leave such effects out.
            </p>
          )}
          {attempt.result.metric === 'g_z' && (
            <p className="mt-1 text-xs text-caution-dark" data-testid="gz-advice">
              ⚠ {GZ_ADVICE}
            </p>
          )}
          {attempt.result.formulaInfo && (
            <div className="mt-1 text-xs text-ink-soft" data-testid="formula">
              <p>
                <strong>Formula:</strong> {attempt.result.formulaInfo.label} — <code className="whitespace-pre-wrap">{attempt.result.formulaInfo.expression}</code>
              </p>
              <p>
                <strong>Source:</strong> {attempt.result.formulaInfo.source}
              </p>
            </div>
          )}
          <p className="mt-1 text-xs text-ink-faint">The server recomputes this from the reported values when the sheet is saved.</p>
        </>
      )}
      {warnings.length > 0 && (
        <ul className="mt-1 text-xs text-caution-dark" aria-label="Plausibility checks">
          {warnings.map((w) => (
            <li key={w.field + w.message}>
              ⚠ Check ({w.field}): {w.message} <span className="text-ink-faint">(threshold from common practice, not a rule)</span>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
