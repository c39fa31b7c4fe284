import { Link } from 'react-router-dom';
import { Button } from '../../../components/ui/Button';
import { ErrorNote } from '../../../components/ui/Notice';
import { useStopFollowing } from '../api/stop-following';

/** Stop following from the follow's own page; what is shown stays until the reader leaves. */
export function StopFollowingButton({ id }: { id: number }) {
  const stop = useStopFollowing();
  if (stop.isSuccess)
    return (
      <p role="status" className="text-sm">
        ✓ You no longer follow this: no more mail or news. <Link to="/follows">My follows</Link>
      </p>
    );
  return (
    <>
      <Button variant="danger" disabled={stop.isPending} onClick={() => stop.mutate(id)}>
        Stop following
      </Button>
      <ErrorNote error={stop.error} title="Still following" />
    </>
  );
}
