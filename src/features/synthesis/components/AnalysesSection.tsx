import { MODERATOR_LABELS } from '../../../../shared/schemas/synthesis';
import { i2Definition } from '../../../../shared/synthesis/analyses';
import type { SynthesisOutput } from '../../../../shared/synthesis/types';
import { digitsFor, fixed, interval as span, pEquals, pValue } from '../../../lib/format';
import { valueLabel } from '../labels';
import type { FigureComponent } from './SynthesisResults';

const dfText = (x: number) => (Number.isInteger(x) ? String(x) : fixed(x, 1));
/** "F(2, 10) = 3.41" or "χ²(2) = 6.82" */
const testText = (kind: 'chisq' | 'F' | null | undefined, value: number | null, df: number | null, df2: number | null | undefined) =>
  kind === 'F' ? `F(${df ?? '—'}, ${df2 ?? '—'}) = ${fixed(value, 2)}` : `${valueLabel('test', 'chisq')}(${df ?? '—'}) = ${fixed(value, 2)}`;

/**
 * The analyses beyond the pooled estimate: small-study effects, τ² and I² by every estimator, subgroups (a
 * separate or one shared τ²), and the meta-regressions (one moderator with its bubble plot; several at once).
 */
export function AnalysesSection({ data, Figure, fileStem }: { data: SynthesisOutput; Figure: FigureComponent; fileStem: string }) {
  const r = data.result;
  const d = digitsFor(data.metric);
  const lvl = `${Math.round(r.level * 1000) / 10}%`;
  const interval = (lo: number | null, hi: number | null) => span(lo, hi, d);
  const reason = (analysis: string, fallback: string) => data.unavailable.find((u) => u.analysis === analysis)?.reason ?? fallback;
  const sub = data.subgroups;
  const shared = sub?.tau2Model === 'pooled';
  const reg = data.regression;
  const one = data.metaRegression;
  const chosen = data.dependence.mode === 'multilevel' ? null : data.request.method;
  return (
    <section aria-labelledby="analyses-heading" className="mt-6">
      <h2 id="analyses-heading">Analyses</h2>

      <h3>Small-study effects</h3>
      <table className="max-w-3xl">
        <caption className="caption-top pb-1 text-left text-sm text-ink-soft">Asymmetry tests and trim-and-fill (estimates to {d} decimals, p to 3)</caption>
        <thead>
          <tr>
            <th>Test</th>
            <th className="num">Statistic</th>
            <th className="num">p</th>
            <th>Reading</th>
          </tr>
        </thead>
        <tbody>
          <tr>
            <td>Egger's regression</td>
            <td className="num">{r.egger ? `intercept ${fixed(r.egger.intercept, 3)} (SE ${fixed(r.egger.se, 3)}), t = ${fixed(r.egger.t, 2)}` : '—'}</td>
            <td className="num">{pValue(r.egger?.p)}</td>
            <td>{r.egger ? (r.egger.p < 0.1 ? '⚠ asymmetry suggested' : 'no clear asymmetry') : reason("Egger's test", 'needs at least 3 studies')}</td>
          </tr>
          <tr>
            <td>Begg's rank correlation</td>
            <td className="num">{data.begg ? `Kendall's τ ${fixed(data.begg.tau, 3)}, z = ${fixed(data.begg.z, 2)}` : '—'}</td>
            <td className="num" data-testid="begg-p">
              {pValue(data.begg?.p)}
              {data.begg?.p_method ? ` (${valueLabel('pMethod', data.begg.p_method)})` : ''}
            </td>
            <td>{data.begg ? (data.begg.p < 0.1 ? '⚠ asymmetry suggested' : 'no clear asymmetry') : reason("Begg's test", '—')}</td>
          </tr>
          <tr>
            <td>Trim-and-fill</td>
            <td className="num">{data.trimFill ? `${data.trimFill.k0} imputed (${data.trimFill.side}); adjusted ${fixed(data.trimFill.estimate, d)} ${interval(data.trimFill.ci_lower, data.trimFill.ci_upper)}` : '—'}</td>
            <td className="num">—</td>
            <td>{data.trimFill ? (data.trimFill.k0 ? 'the adjusted value assumes the gap is publication bias' : 'no studies imputed') : reason('trim-and-fill', '—')}</td>
          </tr>
        </tbody>
      </table>

      {data.estimators && (
        <>
          <h3>Heterogeneity by estimator</h3>
          <table className="max-w-3xl">
            <caption className="caption-top pb-1 text-left text-sm text-ink-soft">
              The same studies pooled by each estimator; each I² and H² from that estimator's own τ² (fixed effect: from Q). ◆ marks the one used here.
            </caption>
            <thead>
              <tr>
                <th>Estimator</th>
                <th className="num">Estimate</th>
                <th className="num">{lvl} CI</th>
                <th className="num">τ² [Q-profile CI]</th>
                <th className="num">I² %</th>
                <th className="num">H²</th>
              </tr>
            </thead>
            <tbody>
              {data.estimators.map((e) => (
                <tr key={e.method}>
                  <td>
                    {e.method === chosen ? '◆ ' : ''}
                    {valueLabel('estimator', e.method)}
                  </td>
                  <td className="num">{fixed(e.estimate, d)}</td>
                  <td className="num">{interval(e.ci_lower, e.ci_upper)}</td>
                  <td className="num">
                    {e.tau2 == null ? '—' : `${fixed(e.tau2, 4)}${e.tau2_ci_lower != null ? ` [${fixed(e.tau2_ci_lower, 4)}, ${fixed(e.tau2_ci_upper, 4)}]` : ''}`}
                  </td>
                  <td className="num">{fixed(e.I2, 1)}</td>
                  <td className="num">{fixed(e.H2, 2)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}

      {sub && (
        <>
          <h3>Subgroups by {valueLabel('subgroup', sub.variable).toLowerCase()}</h3>
          <table className="max-w-3xl">
            <caption className="caption-top pb-1 text-left text-sm text-ink-soft" data-testid="subgroup-test">
              Between subgroups: {sub.test ? testText(sub.test, sub.Q_between, sub.df, sub.df2) : `Q = ${fixed(sub.Q_between, 2)} on ${sub.df ?? '—'} df`}, {pEquals(sub.p)} ·{' '}
              {valueLabel('subgroupTau2', shared ? 'pooled' : 'separate')}
              {shared && sub.tau2_pooled != null ? ` (τ² = ${fixed(sub.tau2_pooled, 4)})` : ''}
            </caption>
            <thead>
              <tr>
                <th>Subgroup</th>
                <th className="num">k</th>
                <th className="num">Estimate</th>
                <th className="num">{lvl} CI</th>
                <th className="num">τ²</th>
                <th className="num">I² %</th>
              </tr>
            </thead>
            <tbody>
              {sub.groups.map((g) => (
                <tr key={g.value}>
                  <td>{g.label}</td>
                  <td className="num">{g.k}</td>
                  <td className="num">{fixed(g.estimate, d)}</td>
                  <td className="num">{interval(g.ci_lower, g.ci_upper)}</td>
                  <td className="num">{fixed(g.tau2, 4)}</td>
                  <td className="num">{fixed(data.dependence.mode === 'multilevel' ? g.I2 : i2Definition(r.method) === 'tau' ? (g.I2_tau ?? g.I2) : g.I2, 1)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}

      {one && (
        <>
          <h3>Meta-regression on {MODERATOR_LABELS[one.moderator].toLowerCase()}</h3>
          <p className="text-sm tabular-nums">
            Slope {one.slope.toPrecision(3)} per unit [{one.slope_ci_lower.toPrecision(3)}, {one.slope_ci_upper.toPrecision(3)}]
            {one.slope_df != null ? `, t(${dfText(one.slope_df)})` : ''}, {pEquals(one.slope_p)}; residual τ² {fixed(one.tau2, 4)}; R² {one.R2 == null ? '—' : `${fixed(one.R2 * 100, 1)}%`}; k = {one.k}
            {one.missing ? ` (${one.missing} studies without a value left out)` : ''}.
          </p>
          {data.figures.bubble && <Figure figure={data.figures.bubble} name={`${fileStem}-bubble`} label="Bubble plot" />}
        </>
      )}

      {reg && (
        <>
          <h3>Meta-regression on several moderators</h3>
          {reg.fewPerCovariate && (
            <p role="note" className="text-sm text-caution-dark">
              ⚠ {reg.k} studies for {reg.terms.length - 1} {reg.terms.length === 2 ? 'coefficient' : 'coefficients'}: fewer than 10 studies per coefficient (common practice), so these estimates are unstable.
            </p>
          )}
          <table className="max-w-3xl">
            <caption className="caption-top pb-1 text-left text-sm text-ink-soft" data-testid="regression-summary">
              {reg.moderators.map((m) => m.label).join(', ')}; k = {reg.k}
              {reg.missing ? ` (${reg.missing} without a value left out)` : ''}. Test of the moderators: {testText(reg.QM_test, reg.QM, reg.QM_df, reg.QM_df2)}, {pEquals(reg.QM_p)}. Residual heterogeneity Q({reg.QE_df}) ={' '}
              {fixed(reg.QE, 2)}, {pEquals(reg.QE_p)}; residual τ² {fixed(reg.tau2, 4)}; R² {reg.R2 == null ? '—' : `${fixed(reg.R2 * 100, 1)}%`}.
              {reg.moderators.filter((m) => m.referenceLabel).map((m) => ` ${m.label} compared with ${m.referenceLabel}.`).join('')}
            </caption>
            <thead>
              <tr>
                <th>Term</th>
                <th className="num">Estimate</th>
                <th className="num">SE</th>
                <th className="num">{reg.hksj ? 't (df)' : 'z'}</th>
                <th className="num">p</th>
                <th className="num">{lvl} CI</th>
              </tr>
            </thead>
            <tbody>
              {reg.terms.map((t) => (
                <tr key={t.label}>
                  <td>{t.label}</td>
                  <td className="num">{t.estimate.toPrecision(3)}</td>
                  <td className="num">{t.se.toPrecision(3)}</td>
                  <td className="num">{t.df == null ? fixed(t.statistic, 2) : `${fixed(t.statistic, 2)} (${dfText(t.df)})`}</td>
                  <td className="num">{pValue(t.p)}</td>
                  <td className="num">
                    [{t.ci_lower.toPrecision(3)}, {t.ci_upper.toPrecision(3)}]
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}
    </section>
  );
}
