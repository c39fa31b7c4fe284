import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { Button } from '../../components/ui/Button';
import { ErrorNote } from '../../components/ui/Notice';
import { NotFoundPage } from './NotFoundPage';

/** What a screen shows when it could not be opened at all (its code failed to load, or it broke while drawing). */
export function RouteErrorPage() {
  const error = useRouteError();
  if (isRouteErrorResponse(error) && error.status === 404) return <NotFoundPage />;
  const message = isRouteErrorResponse(error) ? `${error.status} ${error.statusText}` : error instanceof Error ? error.message : String(error);
  return (
    <div>
      <h1>This page could not be opened</h1>
      <ErrorNote error={message} title="Failed" />
      <p className="mb-2 text-sm text-ink-soft">A newer version of Chronometa may have been installed meanwhile: reloading usually helps.</p>
      <div className="flex gap-3">
        <Button onClick={() => window.location.reload()}>Reload the page</Button>
        <Link to="/" className="self-center text-sm">
          Back to the start
        </Link>
      </div>
    </div>
  );
}
