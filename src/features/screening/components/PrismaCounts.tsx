import { EXCLUSION_COUNT_LABELS } from '../../../../shared/vocabulary/screening';
import { ErrorNote, Loading } from '../../../components/ui/Notice';
import { useCounts } from '../api/get-counts';

const SOURCE_LABELS: Record<string, string> = { bibtex: 'BibTeX imports', ris: 'RIS imports', doi: 'DOI look-ups', seed: 'Registry seed', manual: 'Entered by hand' };

/** The PRISMA 2020 flow numbers as a table (computed by the server from the data on every request). */
export function PrismaCounts() {
  const { data, error, isLoading } = useCounts();
  if (isLoading) return <Loading what="Counting" />;
  if (error) return <ErrorNote error={error} />;
  if (!data) return null;
  const row = (label: string, n: number, indent = false, key = label) => (
    <tr key={key}>
      <th scope="row" className={`bg-transparent font-normal ${indent ? 'pl-6 text-ink-soft' : ''}`}>
        {label}
      </th>
      <td className="num w-24">{n}</td>
    </tr>
  );
  const { title_abstract: ta, full_text: ft } = data.stages;
  // Reasons nobody used at a stage are left out of its lines.
  const reasons = (by: Record<string, number>, key: string) =>
    Object.entries(by)
      .filter(([, n]) => n > 0)
      .map(([r, n]) => row(EXCLUSION_COUNT_LABELS[r] ?? r, n, true, `${key}-${r}`));
  return (
    <table className="w-auto min-w-[22rem]" aria-label="PRISMA 2020 flow counts">
      <tbody>
        {row('Records identified', data.identified.total)}
        {Object.entries(data.identified.bySource).map(([s, n]) => row(SOURCE_LABELS[s] ?? s, n, true))}
        {row('Duplicates removed', data.duplicatesRemoved.total)}
        {row('found at import', data.duplicatesRemoved.importDuplicates, true)}
        {row('merged by curators', data.duplicatesRemoved.merged, true)}
        {row('Records screened on title and abstract', ta.decided)}
        {row('Awaiting title and abstract screening', ta.waiting)}
        {row('Records excluded on title and abstract', ta.excluded)}
        {reasons(ta.excludedByReason, 'ta')}
        {row('Reports assessed in full text', ft.decided)}
        {row('Awaiting full-text assessment', ft.waiting)}
        {row('Reports excluded at full text, with reasons', ft.excluded)}
        {reasons(ft.excludedByReason, 'ft')}
        {row('Included (full text)', data.included)}
      </tbody>
    </table>
  );
}
