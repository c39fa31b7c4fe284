import { METRIC_LABELS } from '../../../../shared/vocabulary/outcomes';
import type { Metric } from '../../../../shared/stats/metrics';
import { formulas } from '../../../../shared/stats/formulas';
import { quantityLabel } from '../../../../shared/vocabulary/parameters';
import type { StoredStudy } from '../api/types';
import { fixed } from '../../../lib/format';

/** A read-only, printable view of a sheet (a submitted coding or a settled record). */
export function SheetView({ studies, compact = false }: { studies: StoredStudy[]; compact?: boolean }) {
  if (!studies.length) return <p className="text-ink-soft">No studies coded.</p>;
  return (
    <div>
      {studies.map((s, i) => (
        <section key={s.id} className="mt-3">
          <h3 className="text-base font-bold">
            Study {i + 1}: {s.label || '—'}
          </h3>
          <p className="text-sm text-ink-soft">
            {s.design ?? '—'} · n {s.n1 ?? '—'}
            {s.n2 != null ? ` + ${s.n2}` : ''} · {s.population ?? '—'}
            {s.diagnosis ? ` (${s.diagnosis})` : ''} · {s.modality ?? '—'} · {s.task ?? '—'} · standard {s.standardMs != null ? `${s.standardMs} ms` : '—'}
          </p>
          <div className="overflow-x-auto">
            <table className="mt-1">
              <thead>
                <tr>
                  <th>#</th>
                  <th>Label</th>
                  <th>Outcome</th>
                  <th>Manipulation</th>
                  <th>Parameter (unit)</th>
                  <th>Metric</th>
                  <th className="num">Effect (3 dp)</th>
                  <th className="num">Variance (4 dp)</th>
                  {!compact && <th>Formula</th>}
                  <th>Provenance</th>
                </tr>
              </thead>
              <tbody>
                {s.effects.map((e, j) => (
                  <tr key={e.id}>
                    <td className="num">{j + 1}</td>
                    <td>
                      {e.label}
                      {e.withdrawnReason && <span className="block text-xs text-refusal">⊘ withdrawn: {e.withdrawnReason}</span>}
                    </td>
                    <td>{e.outcome ?? '—'}</td>
                    <td>{e.manipulation ?? '—'}</td>
                    <td>{e.parameter && e.unit ? quantityLabel(e.parameter, e.unit) : '—'}</td>
                    <td>{e.computed ? METRIC_LABELS[e.computed.metric as Metric] : '—'}</td>
                    <td className="num">{fixed(e.computed?.effect, 3)}</td>
                    <td className="num">{fixed(e.computed?.variance, 4)}</td>
                    {!compact && (
                      <td className="text-xs">
                        {e.computed ? formulas[e.computed.formula]?.label ?? e.computed.formula : '—'}
                        {e.computed?.assumedR != null && <span className="text-caution-dark"> · ⚠ r = {e.computed.assumedR} assumed</span>}
                      </td>
                    )}
                    <td className="text-xs">{[e.page && `p. ${e.page}`, e.locator, !compact && e.quote && `“${e.quote}”`].filter(Boolean).join(' · ')}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </section>
      ))}
    </div>
  );
}
