import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { importFormSchema } from '../../../src/features/imports/forms/import-form';
import { reconcileFormSchema } from '../../../src/features/reconciliation/forms/reconcile';
import { editReferenceSchema, parseAuthors, type EditReferenceValues } from '../../../src/features/references/forms/edit-reference';
import { referenceFiltersSchema } from '../../../src/features/references/forms/reference-filters';
import { decisionFormSchema } from '../../../src/features/screening/forms/decision';
import { pageFromParams, searchFormSchema, searchParams, searchValuesFromParams } from '../../../src/features/search/forms/search-form';
import { plainWords } from '../../../src/lib/forms/plain-words';

const messages = (schema: z.ZodType, input: unknown) =>
  Object.fromEntries((schema.safeParse(input, { error: plainWords }).error?.issues ?? []).map((i) => [i.path.join('.'), i.message]));

describe('plain-worded messages for checks a schema leaves unworded', () => {
  it('says ranges, numbers and empty fields as a form does', () => {
    expect(messages(z.object({ x: z.number().gt(0.5) }), { x: 0.3 })).toEqual({ x: 'must be above 0.5' });
    expect(messages(z.object({ x: z.number().min(1800) }), { x: 1700 })).toEqual({ x: 'must be at least 1800' });
    expect(messages(z.object({ x: z.number().lt(1) }), { x: 1 })).toEqual({ x: 'must be below 1' });
    expect(messages(z.object({ x: z.number() }), { x: Number.NaN })).toEqual({ x: 'enter a number' });
    expect(messages(z.object({ x: z.string().min(1) }), { x: '' })).toEqual({ x: 'fill this in' });
    expect(messages(z.object({ x: z.string().max(3) }), { x: 'abcd' })).toEqual({ x: 'at most 3 characters' });
    expect(messages(z.object({ x: z.enum(['a', 'b']) }), { x: 'c' })).toEqual({ x: 'choose one of the listed values' });
  });

  it('never replaces a message the schema states', () => {
    expect(messages(z.object({ x: z.string().min(3, 'say why (at least 3 characters)') }), { x: 'a' })).toEqual({ x: 'say why (at least 3 characters)' });
  });
});

describe('the reference edit form', () => {
  const values = (patch: Partial<EditReferenceValues> = {}): EditReferenceValues => ({
    title: 'Looming and the stretching of seconds',
    year: '2019',
    container: '',
    doi: '',
    authors: 'Probe, Ida\nOther, Ola',
    abstract: '',
    ...patch,
  });

  it('turns the text into the edit the server takes', () => {
    expect(editReferenceSchema(4).parse(values({ doi: 'https://doi.org/10.5555/ABC.1', container: '  Journal of Invented Psychophysics ' }))).toEqual({
      version: 4,
      title: 'Looming and the stretching of seconds',
      year: 2019,
      container: 'Journal of Invented Psychophysics',
      doi: '10.5555/abc.1',
      authors: [
        { family: 'Probe', given: 'Ida' },
        { family: 'Other', given: 'Ola' },
      ],
      abstract: null,
    });
  });

  it('an empty year is no year; a short one is named at its field', () => {
    expect(editReferenceSchema(1).parse(values({ year: '' })).year).toBeNull();
    expect(messages(editReferenceSchema(1), values({ year: '19' }))).toEqual({ year: 'a year has four digits' });
  });

  it('names every wrong field at once', () => {
    expect(messages(editReferenceSchema(1), values({ year: '19', doi: 'nope', title: '' }))).toEqual({
      year: 'a year has four digits',
      doi: 'a DOI looks like 10.5555/abc',
      title: 'a reference needs a title',
    });
  });

  it('keeps the server schema’s own messages (title, DOI)', () => {
    expect(messages(editReferenceSchema(1), values({ title: '  ' }))).toEqual({ title: 'a reference needs a title' });
    expect(messages(editReferenceSchema(1), values({ doi: 'not a doi' }))).toEqual({ doi: 'a DOI looks like 10.5555/abc' });
  });

  it('reads authors one per line, "Family, Given" or a family name alone', () => {
    expect(parseAuthors('  Varga, Anna Maria \n\nLindqvist\nde la Cruz, J., Jr')).toEqual([
      { family: 'Varga', given: 'Anna Maria' },
      { family: 'Lindqvist' },
      { family: 'de la Cruz', given: 'J., Jr' },
    ]);
    expect(messages(editReferenceSchema(1), values({ authors: ', Ida' }))).toEqual({ 'authors.0.family': 'family name is required' });
  });
});

describe('the screening decision form', () => {
  it('an inclusion drops a reason left from an earlier choice; a note only when written', () => {
    expect(decisionFormSchema('title_abstract').parse({ decision: 'included', reason: 'wrong_population', note: '  ' })).toEqual({ decision: 'included', stage: 'title_abstract' });
  });

  it('a full-text exclusion needs a reason of its stage, and "other" needs a note (the server’s rules)', () => {
    const fullText = decisionFormSchema('full_text');
    expect(messages(fullText, { decision: 'excluded', reason: '', note: '' })).toEqual({ reason: 'a full-text exclusion needs a reason' });
    expect(messages(fullText, { decision: 'excluded', reason: 'other', note: '' })).toEqual({ note: 'say why, when the reason is "other"' });
    expect(fullText.parse({ decision: 'excluded', reason: 'other', note: ' no timing task ' })).toEqual({ decision: 'excluded', reason: 'other', note: 'no timing task', stage: 'full_text' });
    expect(decisionFormSchema('title_abstract').parse({ decision: 'excluded', reason: '', note: '' })).toEqual({ decision: 'excluded', stage: 'title_abstract' });
    expect(messages(decisionFormSchema('title_abstract'), { decision: 'excluded', reason: 'no_usable_statistics', note: '' })).toEqual({ reason: 'pick a reason of this stage' });
  });
});

describe('the reconciliation form', () => {
  const field = (discrepancyId: number, resolution: string, value?: unknown, note = '') => ({ discrepancyId, resolution, value, note });

  it('sends an own value only with that choice, and every field’s note', () => {
    expect(reconcileFormSchema.parse({ version: 3, rationale: ' Table 2 says so ', decisions: [field(1, 'b', 12), field(2, 'value', 12, 'from the text')] })).toEqual({
      version: 3,
      rationale: 'Table 2 says so',
      decisions: [
        { discrepancyId: 1, resolution: 'b', note: '' },
        { discrepancyId: 2, resolution: 'value', value: 12, note: 'from the text' },
      ],
    });
  });

  it('names each field left without a choice, a missing own value and a missing rationale', () => {
    expect(messages(reconcileFormSchema, { version: 3, rationale: 'ok', decisions: [field(1, ''), field(2, 'a'), field(3, 'value')] })).toEqual({
      'decisions.0.resolution': 'choose coder A, coder B or your own value',
      'decisions.2.value': 'enter the value to keep',
      rationale: 'say why (at least 3 characters)',
    });
  });
});

describe('the import form', () => {
  it('asks for entries, or DOIs for a DOI list', () => {
    expect(messages(importFormSchema, { format: 'bibtex', text: ' \n', file: null })).toEqual({ text: 'paste at least one entry, or choose a file' });
    expect(messages(importFormSchema, { format: 'doi', text: '', file: null })).toEqual({ text: 'type at least one DOI' });
  });

  it('sends pasted text with its format', () => {
    expect(importFormSchema.parse({ format: 'ris', text: 'TY  - JOUR\nER  - ', file: null })).toEqual({ format: 'ris', text: 'TY  - JOUR\nER  - ' });
  });
});

describe('the search and reference filters', () => {
  it('turn the inputs into the routes’ queries, empty fields left out', () => {
    expect(searchFormSchema.parse({ q: ' looming ', status: '', yearFrom: '2001', yearTo: '' })).toEqual({ q: 'looming', yearFrom: 2001 });
    expect(referenceFiltersSchema.parse({ q: '  ', status: 'included', yearFrom: '', yearTo: '2020' })).toEqual({ status: 'included', yearTo: 2020 });
  });

  it('name every wrong field at once', () => {
    expect(messages(searchFormSchema, { q: 'x'.repeat(201), status: '', yearFrom: '20', yearTo: '1' })).toEqual({
      q: 'at most 200 characters',
      yearFrom: 'a year has four digits',
      yearTo: 'a year has four digits',
    });
  });

  it('name a half-typed year at its field', () => {
    expect(messages(searchFormSchema, { q: '', status: '', yearFrom: '20', yearTo: '' })).toEqual({ yearFrom: 'a year has four digits' });
    expect(messages(referenceFiltersSchema, { q: '', status: '', yearFrom: '', yearTo: '2o20' })).toEqual({ yearTo: 'a year has four digits' });
  });

  it('a search address round-trips, and a bad status or page falls back', () => {
    const v = { q: 'probe', status: 'included' as const, yearFrom: '2019', yearTo: '2021', manipulation: 'luminance', outcome: 'temporal_order', task: 'bisection' };
    const p = searchParams(v, 3);
    expect(p.toString()).toBe('q=probe&status=included&yearFrom=2019&yearTo=2021&manipulation=luminance&outcome=temporal_order&task=bisection&page=3');
    expect(searchValuesFromParams(p)).toEqual(v);
    expect(pageFromParams(p)).toBe(3);
    expect(searchValuesFromParams(new URLSearchParams('status=maybe')).status).toBe('');
    expect(pageFromParams(new URLSearchParams('page=-4'))).toBe(1);
    expect(pageFromParams(new URLSearchParams('page=two'))).toBe(1);
    expect(searchValuesFromParams(new URLSearchParams('outcome=length&task=guessing'))).toMatchObject({ outcome: '', task: '' });
    expect(searchParams({ q: '', status: '', yearFrom: '', yearTo: '', manipulation: '', outcome: '', task: '' }, 1).toString()).toBe('');
  });
});
