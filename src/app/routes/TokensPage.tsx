import { TokensPanel } from '../../features/tokens/components/TokensPanel';
import { RequireRole } from './RequireRole';

export function TokensPage() {
  return (
    <RequireRole>
      <h1>API tokens</h1>
      <p className="mb-3 text-sm text-ink-soft">
        A token acts with your roles. Send it as <code>Authorization: Bearer &lt;token&gt;</code>; revoking it refuses it at once.
      </p>
      <TokensPanel />
    </RequireRole>
  );
}
