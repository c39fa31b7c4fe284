import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { parseInput } from '../../../server/lib/validate.js';
import { ValidationError } from '../../../server/lib/errors.js';
import { fieldInWords, fieldProblemInWords } from '../../../shared/schemas/plain-words.js';
import { synthesisRequestSchema } from '../../../shared/schemas/synthesis.js';
import { tokenCreateSchema } from '../../../shared/schemas/users.js';
import { pathLikeIn } from '../../support/words.js';


/** Every zod schema exported from shared/schemas. */
async function sharedSchemas(): Promise<Array<[string, z.ZodType]>> {
  const dir = join(import.meta.dirname, '../../../shared/schemas');
  const out: Array<[string, z.ZodType]> = [];
  for (const file of readdirSync(dir).filter((f) => f.endsWith('.ts'))) {
    const mod = (await import(join(dir, file))) as Record<string, unknown>;
    for (const [name, v] of Object.entries(mod)) if (v instanceof z.ZodType) out.push([`${file} ${name}`, v]);
  }
  return out;
}

const WRONG = [undefined, null, 42, -1, 1e12, 'text', '', true, [], {}, [1, 'x'], { __extra: 1 }];

/** Bad inputs for a schema: wrong whole values, and for an object each field given each wrong value in turn. */
function badInputs(schema: z.ZodType): unknown[] {
  const out: unknown[] = [...WRONG];
  if (schema instanceof z.ZodObject) {
    for (const key of Object.keys(schema.shape)) for (const w of WRONG) out.push({ [key]: w });
  }
  return out;
}

describe('validation messages are words for people', () => {
  it('no refusal of any shared schema shows a path, zod wording or API syntax (message and every field detail)', async () => {
    const schemas = await sharedSchemas();
    expect(schemas.length).toBeGreaterThan(50);
    const found: string[] = [];
    let refusals = 0;
    for (const [name, schema] of schemas) {
      for (const input of badInputs(schema)) {
        let err: unknown;
        try {
          parseInput(schema, input);
        } catch (e) {
          err = e;
        }
        if (!(err instanceof ValidationError)) continue;
        refusals++;
        const details = err.details as Array<{ path: string; message: string }>;
        for (const m of [err.message, ...details.map((d) => d.message), ...details.map((d) => fieldProblemInWords(d.path, d.message))]) {
          const bad = pathLikeIn(m);
          if (bad.length) found.push(`${name} ${JSON.stringify(input)}: "${m}" (${bad.join(', ')})`);
        }
      }
    }
    expect(refusals).toBeGreaterThan(1000);
    expect([...new Set(found)].slice(0, 200)).toEqual([]);
  });

  it('no message a schema or a form states in its source holds path-like text (examples in parentheses aside)', () => {
    const root = join(import.meta.dirname, '../../..');
    const files = [
      ...readdirSync(join(root, 'shared/schemas')).map((f) => `shared/schemas/${f}`),
      ...readdirSync(join(root, 'src/features'), { recursive: true, encoding: 'utf8' }).filter((f) => /\/forms\/.*\.ts$/.test(f)).map((f) => `src/features/${f}`),
      ...readdirSync(join(root, 'src/lib/forms')).map((f) => `src/lib/forms/${f}`),
    ].filter((f) => f.endsWith('.ts'));
    const stated = /(?:message|error):\s*'([^']+)'|\(\s*[^,()']+,\s*'([^']+)'\s*\)/g;
    const found: string[] = [];
    let n = 0;
    for (const f of files) {
      for (const m of readFileSync(join(root, f), 'utf8').matchAll(stated)) {
        const text = (m[1] ?? m[2])!;
        if (!/\s/.test(text)) continue; // a key or a code, not a message
        n++;
        const bad = pathLikeIn(text.replace(/\(e\.g\. [^)]*\)/g, ''));
        if (bad.length) found.push(`${f}: "${text}" (${bad.join(', ')})`);
      }
    }
    expect(n).toBeGreaterThan(30);
    expect(found).toEqual([]);
  });

  it('the scan itself catches what the server used to send', () => {
    expect(pathLikeIn('body.filters.yearFrom: Invalid input: expected number, received NaN')).toEqual(
      expect.arrayContaining(['a server path', "zod's wording", 'a camelCase field name']),
    );
    expect(pathLikeIn('Too big: expected number to be <1')).toEqual(expect.arrayContaining(["zod's wording", 'a comparison sign']));
    expect(pathLikeIn('studies.0.n1: fill this in')).toContain('an indexed path');
    expect(pathLikeIn('Unrecognized key: "extra"')).toContain("zod's wording");
    expect(pathLikeIn('The confidence level must be between 50% and 99.9%.')).toEqual([]);
  });

  it('says the confidence level and the token name as the issue asks', () => {
    const level = () => parseInput(synthesisRequestSchema, { level: 2 });
    expect(level).toThrow('The confidence level must be between 50% and 99.9%.');
    expect(() => parseInput(synthesisRequestSchema, { level: 0.3 })).toThrow('The confidence level must be between 50% and 99.9%.');
    expect(() => parseInput(synthesisRequestSchema, { level: 'high' })).toThrow('The confidence level must be between 50% and 99.9%.');
    expect(() => parseInput(tokenCreateSchema, { name: '' })).toThrow(/^Give the token a name\.$/);
    expect(parseInput(synthesisRequestSchema, { level: 0.999 }).level).toBe(0.999);
  });

  it('names fields in words and keeps the paths in details for forms', () => {
    expect(fieldInWords('body.studies.0.effects.1.sd1')).toBe('study 1, effect 2, SD of group 1');
    expect(fieldInWords(['filters', 'yearFrom'])).toBe('from year');
    expect(fieldInWords([])).toBe('the request');
    expect(fieldProblemInWords('body.filters.yearTo', 'a year has four digits')).toBe('To year: a year has four digits.');
    expect(fieldProblemInWords('body.name', 'give the token a name')).toBe('Give the token a name.');
    expect(fieldProblemInWords('query.pageSize', 'must be at most 200')).toBe('Page size: must be at most 200.');
    try {
      parseInput(synthesisRequestSchema, { filters: { yearFrom: 'x' }, method: 'XX' });
      expect.unreachable();
    } catch (e) {
      const err = e as ValidationError;
      expect(err.message).toBe('From year: enter a number (and 1 more).');
      expect(err.details).toEqual([
        { path: 'body.filters.yearFrom', message: 'enter a number' },
        { path: 'body.method', message: 'choose one of the listed values' },
      ]);
    }
  });
});
