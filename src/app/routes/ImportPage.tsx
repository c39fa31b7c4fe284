import { IMPORT_JOB_THRESHOLD } from '../../../shared/schemas/references';
import { ImportForm } from '../../features/imports/components/ImportForm';
import { ImportHistory } from '../../features/imports/components/ImportHistory';
import { RequireRole } from './RequireRole';

export function ImportPage() {
  return (
    <RequireRole role="contributor">
      <h1>Import references</h1>
      <p className="mb-3 max-w-3xl text-sm text-ink-soft">
        Every entry gets its own line in the report: imported, a duplicate of a reference already here (same DOI, or the same title, year and first
        author when neither has a DOI), or rejected with the reason. Good entries import even when others in the file are broken, and importing the same
        file again creates nothing new. A file of {IMPORT_JOB_THRESHOLD.entries.toLocaleString('en')} entries or more is read in the background: its report
        shows how far it has got.
      </p>
      <ImportForm />
      <h2>Earlier imports</h2>
      <ImportHistory />
    </RequireRole>
  );
}
