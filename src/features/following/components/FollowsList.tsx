import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { useFollows } from '../api/get-follows';
import { useStopFollowing } from '../api/stop-following';

/** The signed-in person's follows, each with its thresholds, its feed and a way to stop. */
export function FollowsList() {
  const { data, error, isLoading } = useFollows();
  const stop = useStopFollowing();
  return (
    <div>
      <ErrorNote error={error ?? stop.error} />
      {isLoading && <Loading />}
      {data && data.items.length === 0 && <EmptyState>You follow no synthesis.</EmptyState>}
      {data && data.items.length > 0 && (
        <table>
          <thead>
            <tr>
              <th>Synthesis followed</th>
              <th className="num">Estimate move (× SE)</th>
              <th className="num">New study weight</th>
              <th className="num">Since</th>
              <th>Changes</th>
              <th>Feed</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {data.items.map((f) => (
              <tr key={f.id}>
                <td>{f.snapshotId ? <>Snapshot <Link to={`/snapshots/${f.snapshotId}`}>{f.snapshotId}</Link>: </> : null}{f.summary}</td>
                <td className="num">{f.seShare.toFixed(2)}</td>
                <td className="num">{(f.weightShare * 100).toFixed(0)}%</td>
                <td className="num">{f.createdAt.slice(0, 10)}</td>
                <td>
                  <Link to={`/follows/${f.id}/changes`} aria-label={`What changed: ${f.summary}`}>
                    What changed
                  </Link>
                </td>
                <td>
                  <a href={f.feedUrl}>Atom feed</a>
                </td>
                <td>
                  <Button variant="danger" disabled={stop.isPending} onClick={() => stop.mutate(f.id)} aria-label={`Stop following: ${f.summary}`}>
                    Stop following
                  </Button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}
