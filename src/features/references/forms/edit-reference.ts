import { z } from 'zod';
import { referenceEditSchema, type ReferenceEdit } from '../../../../shared/schemas/references';
import { taking, yearText } from '../../../lib/forms/fields';
import type { ReferenceDetail } from '../api/types';

/** The edit form's inputs: text throughout, authors one per line as "Family, Given". */
export interface EditReferenceValues {
  title: string;
  year: string;
  container: string;
  doi: string;
  authors: string;
  abstract: string;
}

type CslPerson = { family?: string; given?: string; literal?: string };

export function editReferenceValues(r: ReferenceDetail['reference']): EditReferenceValues {
  const csl = r.csl as { author?: CslPerson[] };
  return {
    title: r.title,
    year: r.year ? String(r.year) : '',
    container: r.container ?? '',
    doi: r.doi ?? '',
    authors: (csl.author ?? []).map((a) => (a.literal ? a.literal : [a.family, a.given].filter(Boolean).join(', '))).join('\n'),
    abstract: r.abstract ?? '',
  };
}

/** "Family, Given" per line; a line without a comma is a family name alone. */
export const parseAuthors = (s: string) =>
  s
    .split('\n')
    .map((l) => l.trim())
    .filter(Boolean)
    .map((l) => {
      const [family, ...given] = l.split(',');
      return given.length ? { family: family.trim(), given: given.join(',').trim() } : { family: family.trim() };
    });

const shape = referenceEditSchema.shape;
const orNull = (s: string) => s.trim() || null;

/** The form's text as the edit the server takes: each field checked by the server's rule for it, all at once. */
export const editReferenceSchema = (version: number) =>
  z
    .object({
      title: z.string().pipe(taking<string>()(shape.title)),
      year: yearText.transform((y) => (y ? Number(y) : null)).pipe(taking<number | null>()(shape.year)),
      container: z.string().transform(orNull).pipe(taking<string | null>()(shape.container)),
      doi: z.string().transform(orNull).pipe(taking<string | null>()(shape.doi)),
      authors: z.string().transform(parseAuthors).pipe(taking<ReturnType<typeof parseAuthors>>()(shape.authors)),
      abstract: z.string().transform(orNull).pipe(taking<string | null>()(shape.abstract)),
    })
    .transform((v): ReferenceEdit => ({ version, ...v }))
    .pipe(referenceEditSchema);
