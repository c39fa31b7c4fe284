import { Link } from 'react-router-dom';
import { SCREENING_STAGE_LABELS, type ScreeningStage } from '../../../../shared/vocabulary/screening';
import { ErrorNote } from '../../../components/ui/Notice';
import { useCounts } from '../api/get-counts';

const share = (n: number, total: number) => `${total ? (100 * n) / total : 0}%`;

/** A thin bar of one stage so far (included, excluded, waiting), its counts in words beside it. */
export function StageProgress({ stage }: { stage: ScreeningStage }) {
  const { data, error } = useCounts();
  if (error) return <ErrorNote error={error} />;
  if (!data) return <div className="h-1 rounded bg-paper-edge" aria-hidden />;
  const { included, excluded, waiting, decided } = data.stages[stage];
  const total = decided + waiting;
  const label = SCREENING_STAGE_LABELS[stage];
  return (
    <div className="mb-3">
      <div
        role="progressbar"
        aria-label={`${label} screening progress`}
        aria-valuemin={0}
        aria-valuemax={total}
        aria-valuenow={decided}
        aria-valuetext={`${decided} of ${total} decided at ${label.toLowerCase()}`}
        className="flex h-1 overflow-hidden rounded bg-paper-edge"
      >
        <span className="bg-action" style={{ width: share(included, total) }} />
        <span className="bg-ink-faint" style={{ width: share(excluded, total) }} />
      </div>
      <p className="mt-1 text-xs text-ink-soft" data-testid="stage-counts">
        {label}: <span className="tabular-nums">✓ {included} included</span> · <span className="tabular-nums">✕ {excluded} excluded</span> ·{' '}
        <span className="tabular-nums">○ {waiting} waiting</span> in the registry · <Link to="/screening/counts">PRISMA 2020 flow</Link>
      </p>
    </div>
  );
}
