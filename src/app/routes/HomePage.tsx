import { useMe } from '../../features/auth/api/get-me';
import { signInHref } from '../../lib/sign-in';

export function HomePage() {
  const { data: me } = useMe();
  return (
    <div className="reading max-w-3xl">
      <h1>Chronometa</h1>
      <p className="mb-3">
        A shared registry of what time-perception experiments have found: every reported duration distortion, simultaneity window and
        temporal-order shift, coded twice, reconciled once, converted with a visible formula and pooled on demand.
      </p>
      {!me && (
        <p>
          <a href={signInHref('/')}>Sign in</a> to import references, code papers, reconcile extractions or run syntheses.
        </p>
      )}
    </div>
  );
}
