import { FollowsList } from '../../features/following/components/FollowsList';
import { RequireRole } from './RequireRole';

export function FollowsPage() {
  return (
    <RequireRole>
      <h1>My follows</h1>
      <p className="mb-3 text-sm text-ink-soft">
        When the registry grows, each followed synthesis is run again; you get at most one mail a day when it crosses one of
        its thresholds.
      </p>
      <FollowsList />
    </RequireRole>
  );
}
