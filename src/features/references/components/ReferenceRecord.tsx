import type { ReferenceDetail } from '../api/types';

/** The citation line: authors (year). Title. Journal. DOI. */
export function Citation({ r }: { r: ReferenceDetail['reference'] }) {
  const authors = r.authors.length > 6 ? `${r.authors.slice(0, 6).join(', ')} et al.` : r.authors.join(', ');
  return (
    <p className="reading text-base">
      {authors || 'Anonymous'} ({r.year ?? 'n.d.'}). <span className="font-semibold">{r.title}</span>.{r.container ? <em> {r.container}.</em> : null}{' '}
      {r.doi && (
        <a href={`https://doi.org/${encodeURIComponent(r.doi).replace(/%2F/g, '/')}`} rel="noreferrer noopener" target="_blank">
          doi:{r.doi}
        </a>
      )}
    </p>
  );
}

const show = (v: unknown): string => {
  if (v == null) return '';
  if (typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') return String(v);
  if (Array.isArray(v) && v.every((p) => p && typeof p === 'object' && ('family' in p || 'literal' in p))) {
    return v.map((p) => (p.literal ? p.literal : [p.family, p.given].filter(Boolean).join(', '))).join('; ');
  }
  if (typeof v === 'object' && v !== null && 'date-parts' in v) return ((v as { 'date-parts': unknown[][] })['date-parts'][0] ?? []).join('-');
  return JSON.stringify(v);
};

/** Every CSL-JSON field as stored, as text (never as markup). */
export function CslFields({ csl }: { csl: Record<string, unknown> }) {
  const keys = Object.keys(csl).sort();
  return (
    <table className="max-w-4xl">
      <thead>
        <tr>
          <th scope="col">CSL field</th>
          <th scope="col">Value</th>
        </tr>
      </thead>
      <tbody>
        {keys.map((k) => (
          <tr key={k}>
            <th scope="row" className="w-48 bg-transparent font-mono text-xs font-normal">
              {k}
            </th>
            <td className="break-words">{show(csl[k])}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
