import { SCREENING_STAGES, SCREENING_STAGE_LABELS } from '../../../../shared/vocabulary/screening';
import { ErrorNote, Loading } from '../../../components/ui/Notice';
import { useScreeningAgreement } from '../api/get-agreement';

const pct = (x: number | null) => (x === null ? '—' : `${(100 * x).toFixed(1)} %`);

/** The two screeners' agreement per stage over records they both decided and that are settled. */
export function ScreenerAgreement() {
  const { data, error, isLoading } = useScreeningAgreement();
  if (isLoading) return <Loading what="Counting agreement" />;
  if (error) return <ErrorNote error={error} />;
  if (!data) return null;
  return (
    <div>
      <table className="w-auto min-w-[22rem]" aria-label="Screener agreement">
        <thead>
          <tr>
            <th scope="col">Stage</th>
            <th scope="col" className="num">Pairs</th>
            <th scope="col" className="num">Agreed</th>
            <th scope="col" className="num">Agreement</th>
            <th scope="col" className="num">Cohen’s κ</th>
            <th scope="col" className="num">Open disagreements</th>
          </tr>
        </thead>
        <tbody>
          {SCREENING_STAGES.map((s) => {
            const a = data.stages[s];
            const kappa = a.kappa === null ? '—' : a.kappa === 1 && a.se === 0 ? 'perfect agreement' : `${a.kappa.toFixed(2)}${a.se === null ? '' : ` (SE ${a.se.toFixed(2)})`}`;
            return (
              <tr key={s}>
                <th scope="row" className="bg-transparent font-normal">{SCREENING_STAGE_LABELS[s]}</th>
                <td className="num">{a.pairs}</td>
                <td className="num">{a.agreed}</td>
                <td className="num">{pct(a.percentAgreement)}</td>
                <td className="num">{kappa}</td>
                <td className="num">{a.conflicts}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {SCREENING_STAGES.map((s) =>
        data.stages[s].caution && data.stages[s].pairs > 0 ? (
          <p key={s} role="note" className="mt-1 text-sm text-caution-dark">
            ⚠ {SCREENING_STAGE_LABELS[s]}: {data.stages[s].caution}
          </p>
        ) : null,
      )}
      <p className="mt-1 text-xs text-ink-faint">
        Over records both screeners decided and that are settled; categories are “include” and “exclude” for each reason. κ corrects the agreement
        for what chance alone would give.
      </p>
    </div>
  );
}
