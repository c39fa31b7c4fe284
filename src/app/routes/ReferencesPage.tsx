import { Link, useSearchParams } from 'react-router-dom';
import { ReferencesTable } from '../../features/references/components/ReferencesTable';

export function ReferencesPage() {
  const [params] = useSearchParams();
  const batch = Number(params.get('batch')) || undefined;
  return (
    <>
      <h1>References</h1>
      <p className="mb-3 text-sm text-ink-soft">
        {batch ? (
          <>
            Showing the references of import batch {batch}. <Link to="/references">Show every reference</Link>.
          </>
        ) : (
          'Every paper in the registry (merged duplicates are folded into the record that was kept). Sort by a column, filter, and tick rows to export them.'
        )}
      </p>
      <ReferencesTable batch={batch} />
    </>
  );
}
