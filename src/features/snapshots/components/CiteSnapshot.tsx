import { useState } from 'react';
import type { SnapshotCitation } from '../../../../shared/schemas/synthesis';
import { Button } from '../../../components/ui/Button';

const FORMATS = [
  { key: 'text', label: 'Citation text' },
  { key: 'bibtex', label: 'BibTeX' },
  { key: 'ris', label: 'RIS' },
  { key: 'cslJson', label: 'CSL-JSON' },
] as const;
type Format = (typeof FORMATS)[number]['key'];

const entry = (c: SnapshotCitation, f: Format) => (f === 'cslJson' ? JSON.stringify(c.cslJson, null, 2) : c[f].trim());

/** Copies text: the clipboard when the browser allows it, else a hidden selection and the copy command. */
async function copyText(text: string): Promise<boolean> {
  try {
    if (navigator.clipboard) {
      await navigator.clipboard.writeText(text);
      return true;
    }
  } catch {
    // fall through to the selection
  }
  const area = document.createElement('textarea');
  area.value = text;
  area.setAttribute('readonly', '');
  area.style.position = 'fixed';
  area.style.opacity = '0';
  document.body.appendChild(area);
  area.select();
  const ok = document.execCommand('copy');
  area.remove();
  return ok;
}

/** How to cite the snapshot itself: its identifier, address, registry version and date, and entries to copy. */
export function CiteSnapshot({ citation: c }: { citation: SnapshotCitation }) {
  const [shown, setShown] = useState<Format>('bibtex');
  const [status, setStatus] = useState('');
  const copy = async (f: Format) => {
    setShown(f);
    const label = FORMATS.find((x) => x.key === f)!.label;
    setStatus((await copyText(entry(c, f))) ? `✓ ${label} copied` : `Could not reach the clipboard: select the ${label} below and copy it.`);
  };
  return (
    <section aria-labelledby="cite-heading" className="mt-4 max-w-4xl">
      <h2 id="cite-heading">Cite this snapshot</h2>
      <dl className="grid grid-cols-[minmax(0,7rem)_minmax(0,1fr)] sm:grid-cols-[12rem_minmax(0,1fr)] gap-x-3 gap-y-1 text-sm">
        <dt className="text-ink-soft">Identifier</dt>
        <dd className="font-mono">{c.identifier}</dd>
        <dt className="text-ink-soft">Address</dt>
        <dd className="break-all font-mono">{c.url}</dd>
        <dt className="text-ink-soft">Registry version</dt>
        <dd className="tabular-nums">{c.registryVersion}</dd>
        <dt className="text-ink-soft">Saved on</dt>
        <dd className="tabular-nums">{c.date}</dd>
      </dl>
      <p className="reading mt-2 text-sm">{c.text}</p>
      <div className="mt-2 flex flex-wrap items-center gap-2" role="group" aria-label="Copy a citation">
        {FORMATS.map((f) => (
          <Button key={f.key} aria-pressed={shown === f.key} onClick={() => void copy(f.key)}>
            Copy {f.label}
          </Button>
        ))}
        <span role="status" className="text-sm text-ink-soft">
          {status}
        </span>
      </div>
      <pre aria-label={`${FORMATS.find((x) => x.key === shown)!.label} of this snapshot`} className="mt-2 max-h-64 overflow-auto whitespace-pre-wrap rounded border border-paper-edge bg-paper-deep p-2 text-xs">
        {entry(c, shown)}
      </pre>
    </section>
  );
}
