import { Link } from 'react-router-dom';
import { ErrorNote } from '../../../components/ui/Notice';
import { useCounts } from '../api/get-counts';

const share = (n: number, total: number) => `${total ? (100 * n) / total : 0}%`;

/** A thin bar of screening so far (included, excluded, waiting), its counts in words beside it. */
export function StageProgress() {
  const { data, error } = useCounts();
  if (error) return <ErrorNote error={error} />;
  if (!data) return <div className="h-1 rounded bg-paper-edge" aria-hidden />;
  const { included, awaitingScreening: waiting } = data;
  const excluded = data.excluded.total;
  const total = included + excluded + waiting;
  return (
    <div className="mb-3">
      <div
        role="progressbar"
        aria-label="Screening progress"
        aria-valuemin={0}
        aria-valuemax={total}
        aria-valuenow={included + excluded}
        aria-valuetext={`${included + excluded} of ${total} screened`}
        className="flex h-1 overflow-hidden rounded bg-paper-edge"
      >
        <span className="bg-action" style={{ width: share(included, total) }} />
        <span className="bg-ink-faint" style={{ width: share(excluded, total) }} />
      </div>
      <p className="mt-1 text-xs text-ink-soft">
        <span className="tabular-nums">✓ {included} included</span> · <span className="tabular-nums">✕ {excluded} excluded</span> ·{' '}
        <span className="tabular-nums">○ {waiting} waiting</span> in the registry · <Link to="/screening/counts">PRISMA 2020 flow</Link>
      </p>
    </div>
  );
}
