import { useRef, useState } from 'react';
import { useNavigate } from 'react-router-dom';
import type { ImportFormat } from '../../../../shared/schemas/references';
import { ApiRequestError } from '../../../lib/api-client';
import { Button } from '../../../components/ui/Button';
import { ErrorNote } from '../../../components/ui/Notice';
import { useCreateImport } from '../api/create-import';

const FORMATS: Array<{ value: ImportFormat; label: string; hint: string }> = [
  { value: 'bibtex', label: 'BibTeX', hint: 'Paste @article{…} entries, or choose a .bib file.' },
  { value: 'ris', label: 'RIS', hint: 'Records from “TY  -” to “ER  -”, or a .ris file.' },
  { value: 'doi', label: 'DOI list', hint: 'One DOI per line (10.5555/… or https://doi.org/…). They are looked up in the background.' },
];

export function ImportForm() {
  const [format, setFormat] = useState<ImportFormat>('bibtex');
  const [text, setText] = useState('');
  const [file, setFile] = useState<File | null>(null);
  const [localError, setLocalError] = useState<string | null>(null);
  const fileInput = useRef<HTMLInputElement>(null);
  const navigate = useNavigate();
  const mutation = useCreateImport();
  const fields = mutation.error instanceof ApiRequestError ? mutation.error.fieldErrors() : {};
  const textError = localError ?? fields.text;
  const fileError = fields.file;
  const submit = () => {
    if (!file && !text.trim()) {
      setLocalError(format === 'doi' ? 'type at least one DOI' : 'paste at least one entry, or choose a file');
      return;
    }
    setLocalError(null);
    mutation.mutate(file ? { format, file } : { format, text }, { onSuccess: (data) => navigate(`/imports/${data.batch.id}`) });
  };
  return (
    <form
      className="grid max-w-4xl gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        submit();
      }}
    >
      <fieldset className="flex flex-wrap gap-5">
        <legend className="mb-1 text-sm font-semibold">What are you bringing in?</legend>
        {FORMATS.map((f) => (
          <label key={f.value} className="flex items-center gap-1.5">
            <input type="radio" name="format" value={f.value} checked={format === f.value} onChange={() => setFormat(f.value)} />
            {f.label}
          </label>
        ))}
        {fields.format && <span className="text-sm text-refusal">✕ {fields.format}</span>}
      </fieldset>
      <p className="text-sm text-ink-soft">{FORMATS.find((f) => f.value === format)!.hint}</p>
      <label className="text-sm">
        {format === 'doi' ? 'DOIs' : 'Entries'}
        <textarea
          className="mt-0.5 w-full rounded border border-paper-edge bg-white px-2 py-1 font-mono text-xs"
          rows={12}
          value={text}
          onChange={(e) => setText(e.target.value)}
          disabled={!!file}
          aria-invalid={!!textError}
          aria-describedby="import-text-error"
          spellCheck={false}
        />
        {textError && (
          <span id="import-text-error" className="text-refusal">
            ✕ {textError}
          </span>
        )}
      </label>
      <div className="flex flex-wrap items-center gap-2 text-sm">
        <label>
          …or upload a file (.bib, .ris or .txt, up to 20 MB){' '}
          <input ref={fileInput} type="file" accept=".bib,.bibtex,.ris,.txt,text/plain" onChange={(e) => setFile(e.target.files?.[0] ?? null)} aria-invalid={!!fileError} aria-describedby="import-file-error" />
        </label>
        {file && (
          <Button
            onClick={() => {
              setFile(null);
              if (fileInput.current) fileInput.current.value = '';
            }}
          >
            Remove file
          </Button>
        )}
        {fileError && (
          <span id="import-file-error" className="text-refusal">
            ✕ {fileError}
          </span>
        )}
      </div>
      {mutation.error && !Object.keys(fields).length && <ErrorNote error={mutation.error} />}
      <div>
        <Button type="submit" variant="primary" disabled={mutation.isPending}>
          {mutation.isPending ? 'Importing…' : 'Import'}
        </Button>
      </div>
    </form>
  );
}
