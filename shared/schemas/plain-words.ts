import { z } from 'zod';
import { LABELS } from '../vocabulary/labels.js';

const count = (n: number | bigint, one: string, many: string) => `${n} ${n === 1 || n === 1n ? one : many}`;

const EXPECTED: Record<string, string> = {
  number: 'enter a number',
  int: 'enter a whole number',
  bigint: 'enter a whole number',
  string: 'enter text',
  boolean: 'choose yes or no',
  array: 'give a list',
  object: 'fill in this part',
  date: 'enter a date',
};

const FORMATS: Record<string, string> = {
  email: 'enter an e-mail address',
  url: 'enter a web address',
  datetime: 'enter a date and time',
  date: 'enter a date',
  uuid: 'not an identifier',
  regex: 'not in the expected form',
};

/**
 * Zod's messages in words for people ("must be above 0.5", "enter a number"), for every kind of check a schema
 * left unworded; messages a schema states itself always win. Installed as zod's fallback (`z.config` below), so
 * neither the server's refusals nor the forms ever show zod's own wording ("expected number, received NaN").
 */
export const plainWords: z.core.$ZodErrorMap = (issue) => {
  switch (issue.code) {
    case 'too_small':
      if (issue.origin === 'number' || issue.origin === 'int' || issue.origin === 'bigint')
        return issue.inclusive ? `must be at least ${issue.minimum}` : `must be above ${issue.minimum}`;
      if (issue.origin === 'string') return Number(issue.minimum) <= 1 ? 'fill this in' : `at least ${count(issue.minimum, 'character', 'characters')}`;
      if (issue.origin === 'array' || issue.origin === 'set') return `choose at least ${issue.minimum}`;
      if (issue.origin === 'date') return 'too early';
      return 'too small';
    case 'too_big':
      if (issue.origin === 'number' || issue.origin === 'int' || issue.origin === 'bigint')
        return issue.inclusive ? `must be at most ${issue.maximum}` : `must be below ${issue.maximum}`;
      if (issue.origin === 'string') return `at most ${count(issue.maximum, 'character', 'characters')}`;
      if (issue.origin === 'array' || issue.origin === 'set') return `at most ${issue.maximum}`;
      if (issue.origin === 'date') return 'too late';
      return 'too large';
    case 'invalid_type':
      if (issue.input === undefined || issue.input === null || issue.input === '') return 'fill this in';
      return EXPECTED[issue.expected] ?? 'not in the expected form';
    case 'invalid_value':
      return 'choose one of the listed values';
    case 'invalid_format':
      return FORMATS[issue.format] ?? 'not in the expected form';
    case 'not_multiple_of':
      return Number(issue.divisor) === 1 ? 'enter a whole number' : `must be a multiple of ${issue.divisor}`;
    case 'unrecognized_keys':
      return `this does not take ${issue.keys.length === 1 ? 'a field' : 'fields'} named ${issue.keys.map((k) => `“${k}”`).join(', ')}`;
    case 'invalid_union':
      return 'not one of the accepted choices';
    case 'invalid_key':
      return 'holds a name that is not accepted';
    case 'invalid_element':
      return 'holds a value that is not accepted';
    default:
      return 'not accepted';
  }
};

z.config({ customError: plainWords });

/** Names of request fields in words, where splitting the field's name is not enough. */
const FIELD_WORDS: Record<string, string> = {
  ...Object.fromEntries(Object.entries(LABELS.filter).map(([k, v]) => [k, v.toLowerCase()])),
  level: 'confidence level',
  hksj: 'Hartung–Knapp adjustment',
  r: 'correlation',
  smdFamily: 'standardized mean difference family',
  standardMs: 'standard duration (ms)',
  n: 'sample size',
  n1: 'sample size of group 1',
  n2: 'sample size of group 2',
  sd1: 'SD of group 1',
  sd2: 'SD of group 2',
  m1: 'mean of group 1',
  m2: 'mean of group 2',
  doi: 'DOI',
  doiList: 'DOIs',
  q: 'search text',
  pageSize: 'page size',
  ids: 'records',
  id: 'record',
  entityId: 'record',
  entityType: 'kind of record',
  actorId: 'person',
};

const ITEM: Record<string, string> = { studies: 'study', effects: 'effect', entries: 'entry', decisions: 'decision', fields: 'field', ids: 'record', rows: 'row', authors: 'author' };

/** Groups of fields whose own name adds nothing ("filters, year from" is said "from year"). */
const CONTAINERS = new Set(['filters', 'dependence', 'sheet', 'computed', 'reported']);

const words = (key: string) => FIELD_WORDS[key] ?? key.replace(/([a-z])([A-Z0-9])/g, '$1 $2').replace(/_/g, ' ').toLowerCase();

/**
 * A field's path as people say it: `['studies', 0, 'effects', 1, 'sd1']` → "study 1, effect 2, SD of group 1";
 * the leading `body`/`query`/`path` of a server path is dropped. An empty path is "the request".
 */
export function fieldInWords(path: ReadonlyArray<string | number | symbol> | string): string {
  const parts = (typeof path === 'string' ? path.split('.').filter(Boolean) : path.map(String)).filter((p, i) => !(i === 0 && /^(body|query|path)$/.test(p)));
  const out: string[] = [];
  for (let i = 0; i < parts.length; i++) {
    const p = parts[i]!;
    if (CONTAINERS.has(p) && i < parts.length - 1) continue;
    const next = parts[i + 1];
    if (next !== undefined && /^\d+$/.test(next)) {
      out.push(`${ITEM[p] ?? words(p)} ${Number(next) + 1}`);
      i++;
    } else if (/^\d+$/.test(p)) out.push(`item ${Number(p) + 1}`);
    else out.push(words(p));
  }
  return out.length ? out.join(', ') : 'the request';
}

const sentence = (s: string) => {
  const t = s.trim();
  return `${t.charAt(0).toUpperCase()}${t.slice(1)}${/[.!?)]$/.test(t) ? '' : '.'}`;
};

/**
 * A field problem as one sentence: the message alone when it already names the field ("give the token a name"),
 * else the field in words before it ("Confidence level: must be above 0.5.").
 */
export function fieldProblemInWords(path: ReadonlyArray<string | number | symbol> | string, message: string): string {
  const field = fieldInWords(path);
  const last = field.split(', ').pop()!;
  if (field === 'the request' && message === EXPECTED.object) return 'The request is empty or not in the expected form.';
  if (field === 'the request' || message.toLowerCase().includes(last.toLowerCase())) return sentence(message);
  return sentence(`${field}: ${message}`);
}
