// Pure helpers: the indexed columns of a reference, computed from its CSL-JSON.
import { normaliseDoi } from '../../shared/schemas/references.js';
import type { RefColumns } from '../repositories/refs.js';

import type { Csl, CslName } from '../adapters/citations.js';

export type { Csl };

export type { RefColumns };

/** Lower case, accents and punctuation removed, single spaces: "The {Kappa} Effect!" → "the kappa effect". */
export function normaliseText(s: string): string {
  return s
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/<[^>]*>/g, ' ')
    .replace(/[^a-z0-9]+/g, ' ')
    .trim();
}

/** The title key: the normalised title (a leading article dropped) so "The kappa effect." = "Kappa Effect". */
export function titleKey(title: string): string {
  return normaliseText(title).replace(/^(the|a|an) /, '');
}

export function authorKey(name: string | null | undefined): string {
  return name ? normaliseText(name) : '';
}

export function cslTitle(csl: Csl): string {
  const t = Array.isArray(csl.title) ? csl.title[0] : csl.title;
  return typeof t === 'string' ? t.replace(/\s+/g, ' ').trim() : '';
}

export function cslYear(csl: Csl): number | null {
  const issued = csl.issued ?? csl['published-print'] ?? csl['published-online'];
  const y = issued?.['date-parts']?.[0]?.[0];
  const n = typeof y === 'string' ? Number.parseInt(y, 10) : y;
  if (typeof n === 'number' && Number.isInteger(n)) return n;
  const literal = issued?.literal ?? issued?.raw;
  const m = typeof literal === 'string' ? literal.match(/\b(1[0-9]{3}|2[0-9]{3})\b/) : null;
  return m ? Number(m[1]) : null;
}

export function personName(p: CslName): string {
  if (!p) return '';
  if (p.literal) return String(p.literal);
  return [p.given, p.family].filter(Boolean).join(' ');
}

export function cslAuthors(csl: Csl): string[] {
  const list = Array.isArray(csl.author) ? csl.author : Array.isArray(csl.editor) ? csl.editor : [];
  return list.map(personName).filter(Boolean);
}

export function cslFirstAuthor(csl: Csl): string | null {
  const list = Array.isArray(csl.author) ? csl.author : Array.isArray(csl.editor) ? csl.editor : [];
  const p = list[0];
  if (!p) return null;
  return String(p.family ?? p.literal ?? p.given ?? '').trim() || null;
}

export function cslContainer(csl: Csl): string | null {
  const c = Array.isArray(csl['container-title']) ? csl['container-title'][0] : csl['container-title'];
  return typeof c === 'string' && c.trim() ? c.trim() : null;
}

/** Drops citation-js bookkeeping (_graph, temporary ids) so the stored CSL-JSON is the record itself. */
export function cleanCsl(csl: Csl): Csl {
  const { _graph: _g, ...rest } = csl;
  if (typeof rest.id === 'string' && rest.id.startsWith('temp_id_')) delete rest.id;
  if (rest.DOI) {
    const d = normaliseDoi(String(rest.DOI));
    if (d) rest.DOI = d;
  }
  return rest;
}

export function refColumns(csl: Csl): RefColumns {
  const title = cslTitle(csl);
  return {
    doi: normaliseDoi(csl.DOI ?? null),
    title,
    year: cslYear(csl),
    first_author: cslFirstAuthor(csl),
    container: cslContainer(csl),
    title_key: titleKey(title),
  };
}

/** How much a record says: used to keep the richer of two duplicates. */
export function richness(csl: Csl): number {
  let score = 0;
  for (const [k, v] of Object.entries(csl)) {
    if (k.startsWith('_') || k === 'id' || k === 'citation-key') continue;
    if (v == null || v === '') continue;
    score += Array.isArray(v) ? 1 + Math.min(v.length, 20) / 20 : 1;
    if (k === 'abstract') score += 2;
    if (k === 'DOI') score += 3;
  }
  return score;
}
