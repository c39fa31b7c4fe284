import { z } from 'zod';
import { referenceEditSchema, type ReferenceEdit } from '../../../../shared/schemas/references';
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

/** The form's text, checked and turned into the edit the server takes (and checked again with its schema). */
export const editReferenceSchema = (version: number) =>
  z
    .object({
      title: z.string(),
      year: z.string().trim().regex(/^(\d{4})?$/, 'a year has four digits'),
      container: z.string(),
      doi: z.string(),
      authors: z.string(),
      abstract: z.string(),
    })
    .transform(
      (v): ReferenceEdit => ({
        version,
        title: v.title.trim(),
        year: v.year ? Number(v.year) : null,
        container: v.container.trim() || null,
        doi: v.doi.trim() || null,
        authors: parseAuthors(v.authors),
        abstract: v.abstract.trim() || null,
      }),
    )
    .pipe(referenceEditSchema);
