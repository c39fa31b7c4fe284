import { useState } from 'react';
import { ApiRequestError } from '../../../lib/api-client';
import { Button } from '../../../components/ui/Button';
import { ErrorNote } from '../../../components/ui/Notice';
import { useEditReference } from '../api/edit-reference';
import type { ReferenceDetail } from '../api/types';

const field = 'mt-0.5 w-full rounded border border-paper-edge bg-white px-2 py-1 text-sm';

/** Authors one per line as "Family, Given". */
const parseAuthors = (s: string) =>
  s
    .split('\n')
    .map((l) => l.trim())
    .filter(Boolean)
    .map((l) => {
      const [family, ...given] = l.split(',');
      return given.length ? { family: family.trim(), given: given.join(',').trim() } : { family: family.trim() };
    });

export function EditReferenceForm({ detail, onDone }: { detail: ReferenceDetail; onDone: () => void }) {
  const r = detail.reference;
  const csl = r.csl as { author?: Array<{ family?: string; given?: string; literal?: string }> };
  const [title, setTitle] = useState(r.title);
  const [year, setYear] = useState(r.year ? String(r.year) : '');
  const [container, setContainer] = useState(r.container ?? '');
  const [doi, setDoi] = useState(r.doi ?? '');
  const [authors, setAuthors] = useState((csl.author ?? []).map((a) => (a.literal ? a.literal : [a.family, a.given].filter(Boolean).join(', '))).join('\n'));
  const [abstract, setAbstract] = useState(r.abstract ?? '');
  const [local, setLocal] = useState<Record<string, string>>({});
  const mutation = useEditReference();
  const server = mutation.error instanceof ApiRequestError ? mutation.error.fieldErrors() : {};
  const errors = { ...server, ...local };
  const submit = () => {
    const problems: Record<string, string> = {};
    if (!title.trim()) problems.title = 'a reference needs a title';
    if (year && !/^\d{4}$/.test(year)) problems.year = 'a year has four digits';
    setLocal(problems);
    if (Object.keys(problems).length) return;
    mutation.mutate(
      {
        id: r.id,
        edit: {
          version: r.version,
          title: title.trim(),
          year: year ? Number(year) : null,
          container: container.trim() || null,
          doi: doi.trim() || null,
          authors: parseAuthors(authors),
          abstract: abstract.trim() || null,
        },
      },
      { onSuccess: onDone },
    );
  };
  const err = (k: string) =>
    errors[k] ? (
      <span id={`edit-${k}-error`} className="text-sm text-refusal">
        ✕ {errors[k]}
      </span>
    ) : null;
  return (
    <form
      className="grid max-w-3xl gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        submit();
      }}
    >
      <label>
        Title
        <input className={field} value={title} onChange={(e) => setTitle(e.target.value)} aria-invalid={!!errors.title} aria-describedby="edit-title-error" />
        {err('title')}
      </label>
      <div className="grid grid-cols-3 gap-3">
        <label>
          Year
          <input className={field} inputMode="numeric" value={year} onChange={(e) => setYear(e.target.value)} aria-invalid={!!errors.year} aria-describedby="edit-year-error" />
          {err('year')}
        </label>
        <label className="col-span-2">
          DOI
          <input className={field} value={doi} onChange={(e) => setDoi(e.target.value)} placeholder="10.5555/…" aria-invalid={!!errors.doi} aria-describedby="edit-doi-error" />
          {err('doi')}
        </label>
      </div>
      <label>
        Journal or book
        <input className={field} value={container} onChange={(e) => setContainer(e.target.value)} />
        {err('container')}
      </label>
      <label>
        Authors, one per line as “Family, Given”
        <textarea className={`${field} font-mono`} rows={Math.min(8, Math.max(2, authors.split('\n').length))} value={authors} onChange={(e) => setAuthors(e.target.value)} />
        {err('authors')}
      </label>
      <label>
        Abstract
        <textarea className={field} rows={3} value={abstract} onChange={(e) => setAbstract(e.target.value)} />
      </label>
      {mutation.error && !Object.keys(server).length && <ErrorNote error={mutation.error} />}
      <div className="flex gap-2">
        <Button type="submit" variant="primary" disabled={mutation.isPending}>
          {mutation.isPending ? 'Saving…' : 'Save changes'}
        </Button>
        <Button onClick={onDone}>Cancel</Button>
      </div>
    </form>
  );
}
