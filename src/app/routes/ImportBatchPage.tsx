import { Link, useParams } from 'react-router-dom';
import { BatchReport } from '../../features/imports/components/BatchReport';
import { RequireRole } from './RequireRole';

export function ImportBatchPage() {
  const id = Number(useParams().id);
  return (
    <RequireRole role="contributor">
      <p className="text-sm">
        <Link to="/import">← Import more</Link>
      </p>
      <h1>Import report</h1>
      {Number.isInteger(id) && id > 0 ? <BatchReport id={id} /> : <p>That is not a batch number.</p>}
    </RequireRole>
  );
}
