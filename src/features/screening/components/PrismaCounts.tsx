import { EXCLUSION_REASON_LABELS, type ExclusionReason } from '../../../../shared/vocabulary/screening';
import { ErrorNote, Loading } from '../../../components/ui/Notice';
import { useCounts } from '../api/get-counts';

const SOURCE_LABELS: Record<string, string> = { bibtex: 'BibTeX imports', ris: 'RIS imports', doi: 'DOI look-ups', seed: 'Registry seed', manual: 'Entered by hand' };

/** The PRISMA 2020 flow numbers as a table (computed by the server from the data on every request). */
export function PrismaCounts() {
  const { data, error, isLoading } = useCounts();
  if (isLoading) return <Loading what="Counting" />;
  if (error) return <ErrorNote error={error} />;
  if (!data) return null;
  const row = (label: string, n: number, indent = false) => (
    <tr key={label}>
      <th scope="row" className={`bg-transparent font-normal ${indent ? 'pl-6 text-ink-soft' : ''}`}>
        {label}
      </th>
      <td className="num w-24">{n}</td>
    </tr>
  );
  return (
    <table className="w-auto min-w-[22rem]" aria-label="PRISMA 2020 flow counts">
      <tbody>
        {row('Records identified', data.identified.total)}
        {Object.entries(data.identified.bySource).map(([s, n]) => row(SOURCE_LABELS[s] ?? s, n, true))}
        {row('Duplicates removed', data.duplicatesRemoved.total)}
        {row('found at import', data.duplicatesRemoved.importDuplicates, true)}
        {row('merged by curators', data.duplicatesRemoved.merged, true)}
        {row('Records screened', data.screened)}
        {row('Awaiting screening', data.awaitingScreening)}
        {row('Records excluded', data.excluded.total)}
        {Object.entries(data.excluded.byReason).map(([r, n]) => row(EXCLUSION_REASON_LABELS[r as ExclusionReason] ?? r, n, true))}
        {row('Included', data.included)}
      </tbody>
    </table>
  );
}
