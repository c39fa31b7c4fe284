import { Link, useParams, useSearchParams } from 'react-router-dom';
import type { SynthesisRequest } from '../../../shared/schemas/synthesis';
import { ApiRequestError } from '../../lib/api-client';
import { ErrorNote, Loading } from '../../components/ui/Notice';
import { useFollowChanges } from '../../features/following/api/get-follow-changes';
import { StopFollowingButton } from '../../features/following/components/StopFollowingButton';
import { EffectChanges, ForestThenNow, ResultsThenNow } from '../../features/following/components/Comparison';
import { PlotFigure } from '../../features/plots/components/PlotFigure';
import { synthesisHref } from '../../features/synthesis/codec';
import { RequireRole } from './RequireRole';

const when = (iso: string) => `${iso.replace('T', ' ').slice(0, 16)} UTC`;

function Changes() {
  const id = Number(useParams().id);
  const [params] = useSearchParams();
  const sinceText = params.get('since');
  const since = sinceText && /^\d+$/.test(sinceText) ? Number(sinceText) : undefined;
  const { data: c, error, isLoading } = useFollowChanges(id, since);
  if (isLoading) return <Loading what="Comparing with today’s registry" />;
  if (error)
    return (
      <>
        <ErrorNote error={error instanceof ApiRequestError && error.status === 404 ? `${error.message} See your follows for the ones you have.` : error} />
        <Link to="/follows">My follows</Link>
      </>
    );
  if (!c) return null;
  const thenLabel = c.since.eventId === null ? 'When you began following' : 'Before the last news';
  return (
    <>
      <p className="reading max-w-4xl text-sm">
        <strong>{c.follow.snapshotId ? `Snapshot ${c.follow.snapshotId}: ` : ''}</strong>
        {c.follow.summary}
      </p>
      <p className="text-sm text-ink-soft">
        Since {c.since.eventId === null ? `you began following on ${when(c.since.at)}` : `the change of ${when(c.since.at)}`}, against registry version {c.registryVersion}.
      </p>

      <h2>Results</h2>
      <ResultsThenNow then={c.then} now={c.now} thenLabel={thenLabel} />
      <p className="mt-2 text-sm">
        <Link to={synthesisHref(c.follow.request as SynthesisRequest)}>Run it on today’s registry →</Link>
        {c.follow.snapshotId && (
          <>
            {' · '}
            <Link to={`/snapshots/${c.follow.snapshotId}`}>The snapshot</Link>
          </>
        )}
      </p>

      <h2>Settled effects</h2>
      <EffectChanges changes={c} />

      <h2>Forest plots</h2>
      <ForestThenNow then={c.then} now={c.now} thenLabel={thenLabel} Figure={PlotFigure} stem={`chronometa-follow-${id}`} />

      <div className="mt-4">
        <StopFollowingButton id={id} />
      </div>

      {c.events.length > 0 && (
        <>
          <h2>News of this follow</h2>
          <ul className="text-sm" aria-label="News of this follow">
            {c.events.map((e) => (
              <li key={e.id}>
                {e.id === c.since.eventId ? '▸ ' : ''}
                <Link to={`/follows/${id}/changes?since=${e.id}`}>
                  {when(e.at)}, registry version {e.registryVersion}
                </Link>
                : {e.text}
              </li>
            ))}
          </ul>
          <p className="text-xs text-ink-faint">Choose one to see what changed since just before it. <a href={c.follow.feedUrl}>Atom feed</a></p>
        </>
      )}
    </>
  );
}

export function FollowChangesPage() {
  return (
    <RequireRole>
      <h1>What changed since</h1>
      <Changes />
    </RequireRole>
  );
}
