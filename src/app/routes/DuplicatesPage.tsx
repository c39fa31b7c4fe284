import { DuplicatesList } from '../../features/references/components/DuplicatesList';
import { RequireRole } from './RequireRole';

export function DuplicatesPage() {
  return (
    <RequireRole role="curator">
      <h1>Likely duplicates</h1>
      <p className="mb-3 max-w-3xl text-sm text-ink-soft">
        Pairs with the same title, year and first author that the import could not prove to be one paper. Merging keeps the record you choose (the richer one is
        suggested), moves its screening decisions, attachments and everything else that points at the other, and is written to the audit log.
      </p>
      <DuplicatesList />
    </RequireRole>
  );
}
