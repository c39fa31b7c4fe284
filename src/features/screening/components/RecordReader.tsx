import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { highlightParts } from '../choices';
import type { QueueItem } from '../api/get-queue';

function Marked({ text, terms }: { text: string; terms: string[] }) {
  return (
    <>
      {highlightParts(text, terms).map((p, i) =>
        p.term ? (
          <mark key={i} className="rounded-sm bg-action-light px-0.5 text-ink underline decoration-action/40">
            {p.text}
          </mark>
        ) : (
          p.text
        ),
      )}
    </>
  );
}

const kib = (bytes: number) => `${Math.max(1, Math.round(bytes / 1024))} KiB`;

/** The record being read: bibliographic line, abstract and keywords with the vocabulary's terms marked, attachments. */
export function RecordReader({ item, terms, children }: { item: QueueItem; terms: string[]; children?: ReactNode }) {
  return (
    <article aria-label="Record being read" className="min-w-0">
      <h2 className="mt-0 text-lg">
        <Marked text={item.title} terms={terms} />
      </h2>
      <p className="text-sm text-ink-soft">
        {item.authors.join(', ') || 'Anonymous'} · <span className="tabular-nums">{item.year ?? 'n.d.'}</span>
        {item.container ? ` · ${item.container}` : ''}
        {item.doi ? ` · doi:${item.doi}` : ''} · <Link to={`/references/${item.id}`}>open #{item.id}</Link>
      </p>
      <div className="mt-3 grid gap-4 xl:grid-cols-[minmax(0,1fr)_17rem]">
        <div className="min-w-0">
          <h3 className="sr-only">Abstract</h3>
          <p className="reading max-w-prose text-sm leading-relaxed">
            {item.abstract ? <Marked text={item.abstract} terms={terms} /> : <span className="text-ink-faint">No abstract in the record.</span>}
          </p>
          {item.keywords.length > 0 && (
            <ul aria-label="Keywords" className="mt-3 flex list-none flex-wrap gap-1 pl-0 text-xs">
              {item.keywords.map((k) => (
                <li key={k} className="rounded border border-paper-edge px-1.5 py-0.5">
                  <Marked text={k} terms={terms} />
                </li>
              ))}
            </ul>
          )}
          <p className="mt-3 text-xs text-ink-soft">
            {item.attachments.length === 0
              ? 'No attachments.'
              : item.attachments.map((a, i) => (
                  <span key={a.id}>
                    {i > 0 && ' · '}
                    <a href={`/api/references/${item.id}/attachments/${a.id}`}>
                      📎 {a.filename}
                    </a>{' '}
                    ({kib(a.sizeBytes)})
                  </span>
                ))}
          </p>
        </div>
        <div>{children}</div>
      </div>
    </article>
  );
}
