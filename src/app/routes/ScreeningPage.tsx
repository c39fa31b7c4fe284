import { useSearchParams } from 'react-router-dom';
import { PrismaCounts } from '../../features/screening/components/PrismaCounts';
import { ScreeningQueue } from '../../features/screening/components/ScreeningQueue';
import { RequireRole } from './RequireRole';

export function ScreeningPage() {
  const [params] = useSearchParams();
  const batch = Number(params.get('batch')) || undefined;
  return (
    <RequireRole role="contributor">
      <h1>Screening queue</h1>
      <p className="mb-3 text-sm text-ink-soft">
        Keys: <kbd>I</kbd> include · <kbd>1</kbd>–<kbd>6</kbd> exclude with that reason · <kbd>N</kbd> write a note · <kbd>S</kbd> skip for now. Every decision is kept in
        the reference’s history.
      </p>
      <ScreeningQueue batch={batch} />
      <h2>PRISMA 2020 counts</h2>
      <PrismaCounts />
    </RequireRole>
  );
}
