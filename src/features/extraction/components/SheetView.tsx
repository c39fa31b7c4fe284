import { METRIC_LABELS } from '../../../../shared/vocabulary/outcomes';
import type { Metric } from '../../../../shared/stats/metrics';
import { formulas } from '../../../../shared/stats/formulas';
import { quantityLabel } from '../../../../shared/vocabulary/parameters';
import type { StoredStudy } from '../api/types';
import { fixed } from '../../../lib/format';
import type { ReactNode } from 'react';

/** A field a second coding differs on: marked by a tint, a symbol and words for screen readers. */
function Differs({ on, children }: { on: boolean; children: ReactNode }) {
  if (!on) return <>{children}</>;
  return (
    <mark className="relative rounded bg-caution-light px-0.5 text-ink ring-1 ring-caution" data-differs="">
      <span aria-hidden>≠ </span>
      {children}
      <span className="sr-only"> (the coders differ)</span>
    </mark>
  );
}

/**
 * A read-only, printable view of a sheet (a submitted coding or a settled record). `differs` names the paths
 * (`studies.0.n1`, `studies.0.effects.1.effect` …) where the other coding differs; they are marked.
 */
export function SheetView({ studies, compact = false, differs }: { studies: StoredStudy[]; compact?: boolean; differs?: ReadonlySet<string> }) {
  if (!studies.length) return <p className="text-ink-soft">No studies coded.</p>;
  const d = (path: string) => differs?.has(path) ?? false;
  return (
    <div>
      {d('studies') && (
        <p className="text-sm">
          <Differs on>{studies.length} studies</Differs>
        </p>
      )}
      {studies.map((s, i) => (
        <section key={s.id} className="mt-3">
          <h3 className="text-base font-bold">
            Study {i + 1}: {s.label || '—'}
          </h3>
          <p className="text-sm text-ink-soft">
            <Differs on={d(`studies.${i}.design`)}>{s.design ?? '—'}</Differs> · n <Differs on={d(`studies.${i}.n1`)}>{s.n1 ?? '—'}</Differs>
            {s.n2 != null || d(`studies.${i}.n2`) ? (
              <>
                {' + '}
                <Differs on={d(`studies.${i}.n2`)}>{s.n2 ?? '—'}</Differs>
              </>
            ) : null}{' '}
            · <Differs on={d(`studies.${i}.population`)}>{s.population ?? '—'}</Differs>
            {s.diagnosis || d(`studies.${i}.diagnosis`) ? (
              <>
                {' ('}
                <Differs on={d(`studies.${i}.diagnosis`)}>{s.diagnosis ?? '—'}</Differs>)
              </>
            ) : null}{' '}
            · <Differs on={d(`studies.${i}.modality`)}>{s.modality ?? '—'}</Differs> · <Differs on={d(`studies.${i}.task`)}>{s.task ?? '—'}</Differs> · standard{' '}
            <Differs on={d(`studies.${i}.standardMs`)}>{s.standardMs != null ? `${s.standardMs} ms` : '—'}</Differs>
          </p>
          {d(`studies.${i}.effects`) && (
            <p className="text-sm">
              <Differs on>
                {s.effects.length} effect{s.effects.length === 1 ? '' : 's'}
              </Differs>
            </p>
          )}
          <div className="overflow-x-auto">
            <table className={compact ? 'mt-1 text-xs [&_td]:px-1 [&_th]:px-1' : 'mt-1'}>
              <thead>
                <tr>
                  <th>#</th>
                  <th>Label</th>
                  <th>Outcome</th>
                  <th>Manipulation</th>
                  {!compact && <th>Parameter (unit)</th>}
                  <th>Metric</th>
                  <th className="num">Effect (3 dp)</th>
                  <th className="num">Variance (4 dp)</th>
                  {!compact && <th>Formula</th>}
                  <th>Provenance</th>
                </tr>
              </thead>
              <tbody>
                {s.effects.map((e, j) => {
                  // compact: the parameter (unit) sits under the outcome kind instead of a column of its own
                  const quantity = (
                    <Differs on={d(`studies.${i}.effects.${j}.parameter`) || d(`studies.${i}.effects.${j}.unit`)}>{e.parameter && e.unit ? quantityLabel(e.parameter, e.unit) : '—'}</Differs>
                  );
                  return (
                  <tr key={e.id}>
                    <td className="num">{j + 1}</td>
                    <td>
                      {e.label}
                      {e.withdrawnReason && <span className="block text-xs text-refusal">⊘ withdrawn: {e.withdrawnReason}</span>}
                    </td>
                    <td>
                      <Differs on={d(`studies.${i}.effects.${j}.outcome`)}>{e.outcome ?? '—'}</Differs>
                      {compact && <span className="block text-ink-soft">{quantity}</span>}
                    </td>
                    <td>
                      <Differs on={d(`studies.${i}.effects.${j}.manipulation`)}>{e.manipulation ?? '—'}</Differs>
                    </td>
                    {!compact && <td>{quantity}</td>}
                    <td>{e.computed ? compact ? <abbr title={METRIC_LABELS[e.computed.metric as Metric]}>{e.computed.metric}</abbr> : METRIC_LABELS[e.computed.metric as Metric] : '—'}</td>
                    <td className="num">
                      <Differs on={d(`studies.${i}.effects.${j}.effect`)}>{fixed(e.computed?.effect, 3)}</Differs>
                    </td>
                    <td className="num">
                      <Differs on={d(`studies.${i}.effects.${j}.effect`)}>{fixed(e.computed?.variance, 4)}</Differs>
                    </td>
                    {!compact && (
                      <td className="text-xs">
                        {e.computed ? formulas[e.computed.formula]?.label ?? e.computed.formula : '—'}
                        {e.computed?.assumedR != null && <span className="text-caution-dark"> · ⚠ r = {e.computed.assumedR} assumed</span>}
                      </td>
                    )}
                    <td className="text-xs">{[e.page && `p. ${e.page}`, e.locator, !compact && e.quote && `“${e.quote}”`].filter(Boolean).join(' · ')}</td>
                  </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        </section>
      ))}
    </div>
  );
}
