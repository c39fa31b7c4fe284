import type { CellFitAnswer } from '../../../../shared/schemas/trials';
import { parameterLabel, type TrialTask } from '../../../../shared/trials/fits';

const ms = (v: number | null | undefined) => (v == null || !Number.isFinite(v) ? '—' : v.toFixed(1));

function Interval({ value, ci }: { value: number | null | undefined; ci: { lower: number | null; upper: number | null } | null | undefined }) {
  return (
    <>
      {ms(value)}
      {ci && ci.lower !== null && ci.upper !== null && (
        <span className="text-ink-faint">
          {' '}
          [{ms(ci.lower)}, {ms(ci.upper)}]
        </span>
      )}
    </>
  );
}

/** One row per participant × condition: the fitted parameters with bootstrap 95% intervals and the flags. */
export function FitTable({ task, fits, selected, onSelect }: { task: TrialTask; fits: CellFitAnswer[]; selected: string | null; onSelect: (participant: string) => void }) {
  const window = task === 'simultaneity';
  const cols = window ? (['centre', 'width'] as const) : (['pse', 'jnd'] as const);
  return (
    <div className="max-h-96 overflow-auto rounded border border-paper-edge" tabIndex={0} aria-label="Fits per participant and condition (scrolls)">
      <table className="w-full text-sm">
        <caption className="sr-only">Fits per participant and condition, with bootstrap 95% percentile intervals in brackets (ms)</caption>
        <thead className="sticky top-0 bg-paper-deep text-left text-xs">
          <tr>
            <th className="px-2 py-1">Participant</th>
            <th className="px-2 py-1">Condition</th>
            {cols.map((c) => (
              <th key={c} className="px-2 py-1 text-right">
                {parameterLabel(c, task)} (ms)
              </th>
            ))}
            <th className="px-2 py-1">Checks</th>
          </tr>
        </thead>
        <tbody>
          {fits.map((f) => {
            const fit = f.fit as Record<string, number | null | boolean>;
            return (
              <tr key={`${f.participant}\u0000${f.condition}`} className={`border-t border-paper-edge ${selected === f.participant ? 'bg-action/5' : ''}`}>
                <td className="px-2 py-1">
                  <button type="button" className="underline decoration-dotted" onClick={() => onSelect(f.participant)} aria-label={`Plot participant ${f.participant}`}>
                    {f.participant}
                  </button>
                </td>
                <td className="px-2 py-1">{f.condition}</td>
                {cols.map((c) => (
                  <td key={c} className="px-2 py-1 text-right tabular-nums">
                    <Interval value={fit[c] as number | null} ci={f.ci[c]} />
                  </td>
                ))}
                <td className="px-2 py-1 text-xs">
                  {f.flags.length === 0 ? (
                    <span className="text-ink-faint">✓ none</span>
                  ) : (
                    <ul>
                      {f.flags.map((g) => (
                        <li key={g.code} className={g.commonPractice ? 'text-caution-dark' : 'text-refusal'}>
                          {g.commonPractice ? '⚠' : '✕'} {g.message}
                          {g.commonPractice && <span className="text-ink-faint"> (common practice)</span>}
                        </li>
                      ))}
                    </ul>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
