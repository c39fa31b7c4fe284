import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../../support/random';
import { METRICS } from '../../../shared/stats/metrics';
import { METHODS } from '../../../shared/stats/types';
import {
  MODERATORS,
  ONE_PER_STUDY_RULES,
  REGRESSION_MODERATORS,
  SUBGROUP_VARIABLES,
  synthesisRequestSchema,
  type SynthesisRequest,
  type SynthesisRequestInput,
} from '../../../shared/schemas/synthesis';
import {
  ALL_PARAM,
  DEFAULT_REQUEST,
  decodeRequest,
  encodeRequest,
  filtersHref,
  requestToFormValues,
  synthesisFormSchema,
  synthesisHref,
} from '../../../src/features/synthesis/codec';
import { plainWords } from '../../../src/lib/forms/plain-words';

const request = (input: SynthesisRequestInput): SynthesisRequest => synthesisRequestSchema.parse(input);
const decode = (query: string) => decodeRequest(new URLSearchParams(query));
const roundTrip = (r: SynthesisRequest) => decodeRequest(encodeRequest(r));

/** Every shape the schema allows, one dimension at a time, in its canonical form (one manipulation is a string). */
const SHAPES: Array<[string, SynthesisRequest]> = [
  ['all defaults', DEFAULT_REQUEST],
  ['one manipulation', request({ filters: { manipulation: 'luminance' } })],
  ['several manipulations', request({ filters: { manipulation: ['luminance', 'numerosity', 'looming'] } })],
  ['parameter and unit', request({ filters: { parameter: 'pse', unit: 'ms' } })],
  ['without effects from a bound or approximate', request({ filters: { excludeBound: true, excludeApproximate: true } })],
  ...(['outcome', 'population', 'modality', 'task', 'design'] as const).map((k): [string, SynthesisRequest] => [`filter ${k}`, request({ filters: { [k]: `some_${k}` } })]),
  ...METRICS.map((metric): [string, SynthesisRequest] => [`metric ${metric}`, request({ filters: { metric } })]),
  ['from year', request({ filters: { yearFrom: 1998 } })],
  ['to year', request({ filters: { yearTo: 2021 } })],
  ['year range', request({ filters: { yearFrom: 2000, yearTo: 2000 } })],
  ...METHODS.map((method): [string, SynthesisRequest] => [`method ${method}`, request({ method })]),
  ['HKSJ', request({ method: 'REML', hksj: true })],
  ...[0.8, 0.9, 0.99, 0.999].map((level): [string, SynthesisRequest] => [`level ${level}`, request({ level })]),
  ...[0, 0.25, 0.8, 1].map((r): [string, SynthesisRequest] => [`aggregate r = ${r}`, request({ dependence: { mode: 'aggregate', r } })]),
  ...ONE_PER_STUDY_RULES.map((rule): [string, SynthesisRequest] => [`one per study, ${rule}`, request({ dependence: { mode: 'one', rule } })]),
  ['aggregate, inverse-variance composite', request({ dependence: { mode: 'aggregate', r: 0.6, weighted: true } })],
  ['three-level model, robust', request({ dependence: { mode: 'multilevel', robust: true } })],
  ['three-level model, model-based', request({ dependence: { mode: 'multilevel', robust: false }, subgroup: 'task' })],
  ...SUBGROUP_VARIABLES.map((subgroup): [string, SynthesisRequest] => [`subgroups by ${subgroup}`, request({ subgroup })]),
  ...MODERATORS.map((moderator): [string, SynthesisRequest] => [`moderator ${moderator}`, request({ moderator })]),
  ...REGRESSION_MODERATORS.map((m): [string, SynthesisRequest] => [`several moderators with ${m}`, request({ moderators: ['year', m].filter((x, i, xs) => xs.indexOf(x) === i) as SynthesisRequest['moderators'] })]),
  ['every moderator at once', request({ moderators: [...REGRESSION_MODERATORS] })],
  ['subgroups with one shared τ²', request({ subgroup: 'modality', subgroupTau2: 'pooled' })],
  [
    'everything at once',
    request({
      filters: { manipulation: ['a', 'b'], outcome: 'duration_distortion', metric: 'g_s', population: 'children', modality: 'visual', task: 'bisection', design: 'within', yearFrom: 1990, yearTo: 2020 },
      method: 'PM',
      hksj: true,
      level: 0.9,
      dependence: { mode: 'one', rule: 'smallest_variance' },
      subgroup: 'task',
      moderator: 'standardMs',
    }),
  ],
];

function randomRequest(rand: () => number): SynthesisRequest {
  const pick = <T,>(xs: readonly T[]) => xs[Math.floor(rand() * xs.length)];
  const maybe = <T,>(x: T) => (rand() < 0.5 ? x : undefined);
  const n = Math.floor(rand() * 4);
  const manipulations = Array.from({ length: n }, (_, i) => `term_${i}_${Math.floor(rand() * 100)}`);
  const yearFrom = maybe(1900 + Math.floor(rand() * 100));
  const yearTo = maybe((yearFrom ?? 1900) + Math.floor(rand() * 100));
  return request({
    filters: {
      ...(n === 1 ? { manipulation: manipulations[0] } : n > 1 ? { manipulation: manipulations } : {}),
      ...(rand() < 0.5 ? { metric: pick(METRICS) } : {}),
      ...(rand() < 0.3 ? { outcome: pick(['duration_distortion', 'temporal_order']) } : {}),
      ...(yearFrom === undefined ? {} : { yearFrom }),
      ...(yearTo === undefined ? {} : { yearTo }),
    },
    method: pick(METHODS),
    hksj: rand() < 0.5,
    level: pick([0.9, 0.95, 0.99]),
    dependence: rand() < 0.5 ? { mode: 'aggregate', r: Math.round(rand() * 100) / 100 } : { mode: 'one', rule: pick(ONE_PER_STUDY_RULES) },
    ...(rand() < 0.3 ? { subgroup: pick(SUBGROUP_VARIABLES) } : {}),
    ...(rand() < 0.3 ? { moderator: pick(MODERATORS) } : {}),
    ...(rand() < 0.3 ? { moderators: [...new Set([pick(REGRESSION_MODERATORS), pick(REGRESSION_MODERATORS)])] } : {}),
  });
}

describe('synthesis codec: request → address → request', () => {
  it.each(SHAPES)('round-trips %s', (_name, r) => {
    expect(roundTrip(r)).toEqual(r);
  });

  it('round-trips 300 seeded random requests', () => {
    const rand = mulberry32(20240611);
    for (let i = 0; i < 300; i++) {
      const r = randomRequest(rand);
      expect(roundTrip(r)).toEqual(r);
    }
  });

  it('reads a one-item manipulation list as that one manipulation (the same filter)', () => {
    expect(roundTrip(request({ filters: { manipulation: ['luminance'] } }))).toEqual(request({ filters: { manipulation: 'luminance' } }));
  });
});

describe('synthesis codec: request → form values → request (through the form schema)', () => {
  it.each(SHAPES)('round-trips %s', (_name, r) => {
    expect(synthesisFormSchema.parse(requestToFormValues(r))).toEqual(r);
  });

  it('round-trips 300 seeded random requests', () => {
    const rand = mulberry32(7);
    for (let i = 0; i < 300; i++) {
      const r = randomRequest(rand);
      expect(synthesisFormSchema.parse(requestToFormValues(r))).toEqual(r);
    }
  });

  it('keeps the other dependence option typed in while the form shows the first', () => {
    const values = requestToFormValues(request({ dependence: { mode: 'aggregate', r: 0.3 } }));
    values.dependence.mode = 'one';
    values.dependence.rule = 'first_coded';
    expect(synthesisFormSchema.parse(values).dependence).toEqual({ mode: 'one', rule: 'first_coded' });
  });

  it('ignores a correlation left unreadable while one effect per study is kept (the field is hidden then)', () => {
    const values = requestToFormValues(DEFAULT_REQUEST);
    values.dependence = { mode: 'one', r: 'junk', rule: 'smallest_variance', robust: true, weighted: false };
    expect(synthesisFormSchema.parse(values).dependence).toEqual({ mode: 'one', rule: 'smallest_variance' });
    values.dependence.mode = 'aggregate';
    expect(synthesisFormSchema.safeParse(values).error?.issues.map((i) => i.path.join('.'))).toEqual(['dependence.r']);
  });
});

describe('synthesis codec: defaults are left out of the address', () => {
  it('an all-default request is ?all=1, and nothing else', () => {
    expect(encodeRequest(DEFAULT_REQUEST).toString()).toBe(`${ALL_PARAM}=1`);
    expect(encodeRequest(request({ method: 'DL', hksj: false, level: 0.95, dependence: { mode: 'aggregate', r: 0.5 } })).toString()).toBe('all=1');
  });

  it('writes only what differs from the defaults', () => {
    expect(encodeRequest(request({ filters: { manipulation: 'luminance' } })).toString()).toBe('manipulation=luminance');
    expect(encodeRequest(request({ method: 'REML' })).toString()).toBe('method=REML');
    expect(encodeRequest(request({ level: 0.9 })).toString()).toBe('level=0.9');
    expect(encodeRequest(request({ dependence: { mode: 'aggregate', r: 0.8 } })).toString()).toBe('r=0.8');
    expect(encodeRequest(request({ dependence: { mode: 'one', rule: 'largest_n' } })).toString()).toBe('dependence=one');
    expect(encodeRequest(request({ dependence: { mode: 'one', rule: 'first_coded' } })).toString()).toBe('dependence=one&rule=first_coded');
    expect(encodeRequest(request({ dependence: { mode: 'multilevel', robust: true } })).toString()).toBe('dependence=multilevel');
    expect(encodeRequest(request({ dependence: { mode: 'multilevel', robust: false } })).toString()).toBe('dependence=multilevel&robust=0');
    expect(encodeRequest(request({ dependence: { mode: 'aggregate', r: 0.5, weighted: true } })).toString()).toBe('weighted=1');
    expect(encodeRequest(request({ hksj: true })).toString()).toBe('hksj=1');
  });

  it('builds the synthesis screen address, and an atlas cell address from its filters', () => {
    expect(synthesisHref(request({ filters: { manipulation: ['a', 'b'] } }))).toBe('/synthesis?manipulation=a&manipulation=b');
    expect(filtersHref({ manipulation: 'numerosity', outcome: 'duration_distortion', metric: 'g_s' })).toBe(
      '/synthesis?manipulation=numerosity&outcome=duration_distortion&metric=g_s',
    );
    expect(filtersHref({})).toBe('/synthesis?all=1');
  });

  it('still opens links written with every option spelled out', () => {
    expect(decode('manipulation=luminance&method=DL&dependence=aggregate&r=0.5&level=0.95')).toEqual(request({ filters: { manipulation: 'luminance' } }));
  });
});

describe('synthesis codec: a bad address falls back, never crashes', () => {
  it('an address that asks for nothing is no request (the screen waits for the form)', () => {
    expect(decode('')).toBeNull();
    expect(decode('utm_source=mail&page=2')).toBeNull();
  });

  it.each<[string, string, SynthesisRequestInput]>([
    ['an unknown method', 'method=XYZ', {}],
    ['a level that is not a number', 'level=abc', {}],
    ['a level outside (0.5, 1)', 'level=1.5', {}],
    ['a correlation above 1', 'r=2', {}],
    ['a correlation that is not a number', 'r=half', {}],
    ['an unknown dependence mode', 'dependence=average&r=0.3', { dependence: { mode: 'aggregate', r: 0.3 } }],
    ['an unknown one-per-study rule', 'dependence=one&rule=random', { dependence: { mode: 'one', rule: 'largest_n' } }],
    ['an unknown metric', 'metric=cohens_q&manipulation=a', { filters: { manipulation: 'a' } }],
    ['an unknown subgroup variable', 'subgroup=colour', {}],
    ['an unknown moderator', 'moderator=weight', {}],
    ['an unknown one of several moderators', 'moderators=weight&moderators=year', { moderators: ['year'] }],
    ['a moderator chosen twice', 'moderators=year&moderators=year', {}],
    ['one shared τ² without subgroups', 'subgroupTau2=pooled', {}],
    ['a τ² choice other than pooled', 'subgroup=task&subgroupTau2=common', { subgroup: 'task' }],
    ['a year before 1800', 'yearFrom=1700&yearTo=2000', { filters: { yearTo: 2000 } }],
    ['a year that is not a number', 'yearFrom=nineteen', {}],
    ['a from-year after the to-year (the to-year goes)', 'yearFrom=2010&yearTo=2000', { filters: { yearFrom: 2010 } }],
    ['empty and over-long manipulations among good ones', `manipulation=a&manipulation=&manipulation=${'x'.repeat(121)}&manipulation=b`, { filters: { manipulation: ['a', 'b'] } }],
    ['an empty outcome', 'outcome=&task=reproduction', { filters: { task: 'reproduction' } }],
    ['hksj written as true', 'hksj=true', { hksj: true }],
    ['hksj with any other value', 'hksj=yes', {}],
  ])('drops %s', (_name, query, expected) => {
    expect(decode(query)).toEqual(request(expected));
  });

  it('keeps at most 50 manipulations', () => {
    const query = Array.from({ length: 60 }, (_, i) => `manipulation=t${i}`).join('&');
    expect(decode(query)?.filters.manipulation).toEqual(Array.from({ length: 50 }, (_, i) => `t${i}`));
  });

  it('survives 500 seeded addresses of garbage, always giving a request the server schema accepts', () => {
    const rand = mulberry32(99);
    const keys = ['manipulation', 'outcome', 'metric', 'population', 'modality', 'task', 'design', 'yearFrom', 'yearTo', 'method', 'hksj', 'level', 'dependence', 'r', 'rule', 'robust', 'weighted', 'subgroup', 'moderator', 'moderators', 'subgroupTau2'];
    const junk = ['', ' ', '-1', '0', '1', '0.5', '1e309', 'NaN', 'null', '{}', '[]', 'DL', 'one', 'multilevel', 'REML', 'g_s', '2000', '1799', '\u0000', 'é'.repeat(200)];
    for (let i = 0; i < 500; i++) {
      const p = new URLSearchParams();
      for (const k of keys) if (rand() < 0.4) p.append(k, junk[Math.floor(rand() * junk.length)]);
      const decoded = decodeRequest(p);
      if (decoded) expect(synthesisRequestSchema.safeParse(decoded).success).toBe(true);
    }
  });
});

describe('synthesis form schema: messages at the form fields', () => {
  const values = () => requestToFormValues(DEFAULT_REQUEST);
  // as the form's resolver parses: with the plain-worded messages
  const issues = (v: ReturnType<typeof values>) => (synthesisFormSchema.safeParse(v, { error: plainWords }).error?.issues ?? []).map((i) => [i.path.join('.'), i.message]);

  it('a year of other than four digits, at its field', () => {
    const v = values();
    v.filters.yearFrom = '201';
    expect(issues(v)).toEqual([['filters.yearFrom', 'a year has four digits']]);
  });

  it('names every wrong field at once, each in words', () => {
    const v = values();
    v.filters.yearFrom = '201';
    v.level = '0.3';
    v.dependence.r = 'half';
    expect(Object.fromEntries(issues(v))).toEqual({
      'filters.yearFrom': 'a year has four digits',
      level: 'the confidence level must be between 50% and 99.9%',
      'dependence.r': 'enter a number, such as 0.95',
    });
  });

  it('a from-year after the to-year, at the to-year (the server schema’s own rule)', () => {
    const v = values();
    v.filters.yearFrom = '2010';
    v.filters.yearTo = '2000';
    expect(issues(v)).toEqual([['filters.yearTo', 'the from-year must not be after the to-year']]);
  });

  it('a level or correlation that is not a number, or out of range', () => {
    const v = values();
    v.level = 'high';
    expect(issues(v)).toEqual([['level', 'enter a number, such as 0.95']]);
    v.level = '0.4';
    v.dependence.r = '1.2';
    expect(issues(v).map(([path]) => path).sort()).toEqual(['dependence.r', 'level']);
  });
});
