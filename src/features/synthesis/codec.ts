import { z } from 'zod';
import { dependenceSchema, synthesisFiltersSchema, synthesisRequestSchema, type SynthesisRequest } from '../../../shared/schemas/synthesis';
import { numberOrNothing, numberText, numericText as numeric, yearText } from '../../lib/forms/fields';

/**
 * The one translation of a synthesis request between its three forms: the request the server takes, the address
 * (URL search parameters, so a synthesis can be linked and rerun) and the form's values (text until parsed).
 */
export const DEFAULT_REQUEST: SynthesisRequest = synthesisRequestSchema.parse({});

const TEXT_FILTERS = ['outcome', 'parameter', 'unit', 'metric', 'population', 'modality', 'task', 'design'] as const;
const YEAR_FILTERS = ['yearFrom', 'yearTo'] as const;
const FLAG_FILTERS = ['excludeBound', 'excludeApproximate'] as const;
const MAX_MANIPULATIONS = 50;
/** The address of a synthesis with every option at its default and no filter. */
export const ALL_PARAM = 'all';

const KNOWN_PARAMS = new Set<string>([
  ALL_PARAM,
  'manipulation',
  ...TEXT_FILTERS,
  ...YEAR_FILTERS,
  ...FLAG_FILTERS,
  'method',
  'hksj',
  'level',
  'dependence',
  'r',
  'rule',
  'robust',
  'weighted',
  'subgroup',
  'moderator',
  'moderators',
  'subgroupTau2',
  'smdFamily',
]);

/** What the form's inputs hold: the request's shape, with text where the user types numbers. */
export interface SynthesisFormValues {
  filters: {
    manipulation: string[];
    outcome: string;
    parameter: string;
    unit: string;
    metric: string;
    population: string;
    modality: string;
    task: string;
    design: string;
    yearFrom: string;
    yearTo: string;
    excludeBound: boolean;
    excludeApproximate: boolean;
  };
  method: string;
  hksj: boolean;
  level: string;
  dependence: { mode: DependenceMode; r: string; rule: string; robust: boolean; weighted: boolean };
  subgroup: string;
  moderator: string;
  /** the several-moderator meta-regression's moderators (none: not run) */
  moderators: string[];
  /** '' (a separate τ² per subgroup) or 'pooled' */
  subgroupTau2: string;
  /** '' or an SMD family pooled as one metric ('raw_score') */
  smdFamily: string;
}

export type DependenceMode = 'aggregate' | 'one' | 'multilevel';
const MODES: readonly DependenceMode[] = ['aggregate', 'one', 'multilevel'];

// ---- request → address -------------------------------------------------------------------------------------

/** The request as search parameters, leaving out every default (an all-default request becomes `?all=1`). */
export function encodeRequest(request: SynthesisRequest): URLSearchParams {
  const p = new URLSearchParams();
  const f = request.filters;
  for (const m of ([] as string[]).concat(f.manipulation ?? [])) p.append('manipulation', m);
  for (const k of TEXT_FILTERS) if (f[k] !== undefined) p.set(k, f[k]);
  for (const k of YEAR_FILTERS) if (f[k] !== undefined) p.set(k, String(f[k]));
  for (const k of FLAG_FILTERS) if (f[k]) p.set(k, '1');
  if (request.method !== DEFAULT_REQUEST.method) p.set('method', request.method);
  if (request.hksj) p.set('hksj', '1');
  if (request.level !== DEFAULT_REQUEST.level) p.set('level', String(request.level));
  const dep = request.dependence;
  if (dep.mode === 'one') {
    p.set('dependence', 'one');
    if (dep.rule !== 'largest_n') p.set('rule', dep.rule);
  } else if (dep.mode === 'multilevel') {
    p.set('dependence', 'multilevel');
    if (!dep.robust) p.set('robust', '0');
  } else {
    if (dep.r !== 0.5) p.set('r', String(dep.r));
    if (dep.weighted) p.set('weighted', '1');
  }
  if (request.subgroup) p.set('subgroup', request.subgroup);
  if (request.moderator) p.set('moderator', request.moderator);
  for (const m of request.moderators ?? []) p.append('moderators', m);
  if (request.subgroup && request.subgroupTau2 === 'pooled') p.set('subgroupTau2', 'pooled');
  if (request.smdFamily) p.set('smdFamily', request.smdFamily);
  if (p.size === 0) p.set(ALL_PARAM, '1');
  return p;
}

/** The synthesis screen's address for a request. */
export const synthesisHref = (request: SynthesisRequest) => `/synthesis?${encodeRequest(request).toString()}`;

/** The address of a synthesis over the given filters (as an atlas cell states them), other options at their defaults. */
export const filtersHref = (filters: Record<string, string>) => synthesisHref(decodeRequest(new URLSearchParams(filters)) ?? DEFAULT_REQUEST);

// ---- address → request -------------------------------------------------------------------------------------

/** The form's values as the address holds them (a parameter that is not there keeps its default). */
function valuesFromParams(p: URLSearchParams): SynthesisFormValues {
  const d = requestToFormValues(DEFAULT_REQUEST);
  const get = (k: string, fallback: string) => p.get(k) ?? fallback;
  return {
    filters: {
      manipulation: p.getAll('manipulation'),
      outcome: get('outcome', ''),
      parameter: get('parameter', ''),
      unit: get('unit', ''),
      metric: get('metric', ''),
      population: get('population', ''),
      modality: get('modality', ''),
      task: get('task', ''),
      design: get('design', ''),
      yearFrom: get('yearFrom', ''),
      yearTo: get('yearTo', ''),
      excludeBound: p.get('excludeBound') === '1' || p.get('excludeBound') === 'true',
      excludeApproximate: p.get('excludeApproximate') === '1' || p.get('excludeApproximate') === 'true',
    },
    method: get('method', d.method),
    hksj: p.get('hksj') === '1' || p.get('hksj') === 'true',
    level: get('level', d.level),
    dependence: {
      mode: MODES.find((m) => m === p.get('dependence')) ?? 'aggregate',
      r: get('r', d.dependence.r),
      rule: get('rule', d.dependence.rule),
      robust: !(p.get('robust') === '0' || p.get('robust') === 'false'),
      weighted: p.get('weighted') === '1' || p.get('weighted') === 'true',
    },
    subgroup: get('subgroup', ''),
    moderator: get('moderator', ''),
    moderators: p.getAll('moderators'),
    subgroupTau2: get('subgroupTau2', ''),
    smdFamily: get('smdFamily', ''),
  };
}

const manipulationFilter = synthesisFiltersSchema.shape.manipulation;

/** Removes the value at `path` so the schema's default (or "any") takes its place. */
function dropAt(candidate: Record<string, unknown>, path: PropertyKey[]): boolean {
  if (path.length === 0) return false;
  let parent: unknown = candidate;
  for (const key of path.slice(0, -1)) {
    parent = (parent as Record<PropertyKey, unknown> | undefined)?.[key];
    if (parent === null || typeof parent !== 'object') return false;
  }
  const last = path[path.length - 1];
  if (Array.isArray(parent) && typeof last === 'number') parent.splice(last, 1);
  else delete (parent as Record<PropertyKey, unknown>)[last];
  return true;
}

/** Parses what may be wrong, dropping one refused part at a time until the rest parses; never throws. */
function parseLeniently(candidate: Record<string, unknown>): SynthesisRequest {
  for (let attempt = 0; attempt < 50; attempt++) {
    const parsed = synthesisRequestSchema.safeParse(candidate);
    if (parsed.success) return parsed.data;
    if (!dropAt(candidate, parsed.error.issues[0].path)) break;
  }
  return DEFAULT_REQUEST;
}

/**
 * The request an address asks for, or null when it asks for none (the screen then waits for the form). A value
 * the schema refuses falls back to its default, so a hand-edited or old link still opens.
 */
export function decodeRequest(params: URLSearchParams): SynthesisRequest | null {
  if (![...params.keys()].some((k) => KNOWN_PARAMS.has(k))) return null;
  const values = valuesFromParams(params);
  values.filters.manipulation = values.filters.manipulation.filter((m) => manipulationFilter.safeParse(m).success).slice(0, MAX_MANIPULATIONS);
  return parseLeniently(candidateFromValues(values));
}

// ---- request ↔ form values ---------------------------------------------------------------------------------

export function requestToFormValues(request: SynthesisRequest): SynthesisFormValues {
  const f = request.filters;
  const dep = request.dependence;
  return {
    filters: {
      manipulation: ([] as string[]).concat(f.manipulation ?? []),
      outcome: f.outcome ?? '',
      parameter: f.parameter ?? '',
      unit: f.unit ?? '',
      metric: f.metric ?? '',
      population: f.population ?? '',
      modality: f.modality ?? '',
      task: f.task ?? '',
      design: f.design ?? '',
      yearFrom: f.yearFrom === undefined ? '' : String(f.yearFrom),
      yearTo: f.yearTo === undefined ? '' : String(f.yearTo),
      excludeBound: f.excludeBound === true,
      excludeApproximate: f.excludeApproximate === true,
    },
    method: request.method,
    hksj: request.hksj,
    level: String(request.level),
    dependence: {
      mode: dep.mode,
      r: String(dep.mode === 'aggregate' ? dep.r : 0.5),
      rule: dep.mode === 'one' ? dep.rule : 'largest_n',
      robust: dep.mode === 'multilevel' ? dep.robust : true,
      weighted: dep.mode === 'aggregate' ? dep.weighted === true : false,
    },
    subgroup: request.subgroup ?? '',
    moderator: request.moderator ?? '',
    moderators: [...(request.moderators ?? [])],
    subgroupTau2: request.subgroupTau2 ?? '',
    smdFamily: request.smdFamily ?? '',
  };
}

/** The form's values with their numbers read (NaN where the text is no number). */
type ReadValues = Omit<SynthesisFormValues, 'filters' | 'level' | 'dependence'> & {
  filters: Omit<SynthesisFormValues['filters'], 'yearFrom' | 'yearTo'> & { yearFrom?: number; yearTo?: number };
  level?: number;
  dependence: { mode: DependenceMode; r?: number; rule: string; robust: boolean; weighted: boolean };
};

const readNumbers = (v: SynthesisFormValues): ReadValues => ({
  ...v,
  filters: { ...v.filters, yearFrom: numberOrNothing(v.filters.yearFrom), yearTo: numberOrNothing(v.filters.yearTo) },
  level: numberOrNothing(v.level),
  dependence: { ...v.dependence, r: numberOrNothing(v.dependence.r) },
});

const candidateFromValues = (v: SynthesisFormValues) => candidateFromRead(readNumbers(v));

/** The request the schema checks: empty fields left out. */
function candidateFromRead(v: ReadValues): Record<string, unknown> {
  const filters: Record<string, unknown> = {};
  const manipulation = v.filters.manipulation.filter(Boolean);
  if (manipulation.length) filters.manipulation = manipulation.length === 1 ? manipulation[0] : manipulation;
  for (const k of TEXT_FILTERS) if (v.filters[k]) filters[k] = v.filters[k];
  for (const k of YEAR_FILTERS) if (v.filters[k] !== undefined) filters[k] = v.filters[k];
  for (const k of FLAG_FILTERS) if (v.filters[k]) filters[k] = true;
  const { level } = v;
  const { r } = v.dependence;
  return {
    filters,
    method: v.method || undefined,
    hksj: v.hksj,
    ...(level === undefined ? {} : { level }),
    dependence:
      v.dependence.mode === 'one'
        ? { mode: 'one', rule: v.dependence.rule || undefined }
        : v.dependence.mode === 'multilevel'
          ? { mode: 'multilevel', robust: v.dependence.robust }
          : { mode: 'aggregate', ...(r === undefined ? {} : { r }), ...(v.dependence.weighted ? { weighted: true } : {}) },
    ...(v.subgroup ? { subgroup: v.subgroup } : {}),
    ...(v.moderator ? { moderator: v.moderator } : {}),
    ...(v.moderators.length ? { moderators: v.moderators } : {}),
    ...(v.subgroup && v.subgroupTau2 === 'pooled' ? { subgroupTau2: 'pooled' } : {}),
    ...(v.smdFamily ? { smdFamily: v.smdFamily } : {}),
  };
}

const filterShape = synthesisFiltersSchema.shape;

const formValuesSchema = z.object({
  filters: z.object({
    manipulation: z.array(z.string()),
    outcome: z.string(),
    parameter: z.string(),
    unit: z.string(),
    metric: z.string(),
    population: z.string(),
    modality: z.string(),
    task: z.string(),
    design: z.string(),
    yearFrom: numeric(yearText, filterShape.yearFrom),
    yearTo: numeric(yearText, filterShape.yearTo),
    excludeBound: z.boolean(),
    excludeApproximate: z.boolean(),
  }),
  method: z.string(),
  hksj: z.boolean(),
  level: numeric(numberText, synthesisRequestSchema.shape.level.removeDefault().optional()),
  // The correlation is checked only while it is used (and shown).
  dependence: z.discriminatedUnion('mode', [
    z.object({ mode: z.literal('aggregate'), r: numeric(numberText, dependenceSchema.options[0].shape.r.removeDefault().optional()), rule: z.string(), robust: z.boolean(), weighted: z.boolean() }),
    z.object({ mode: z.literal('one'), r: z.string(), rule: z.string(), robust: z.boolean(), weighted: z.boolean() }),
    z.object({ mode: z.literal('multilevel'), r: z.string(), rule: z.string(), robust: z.boolean(), weighted: z.boolean() }),
  ]),
  subgroup: z.string(),
  moderator: z.string(),
  moderators: z.array(z.string()),
  subgroupTau2: z.string().catch(''), // undefined while its select is disabled (no subgroups)
  smdFamily: z.string(),
});

/**
 * The synthesis form's schema: each field's text checked on its own (so every wrong field is named at once), then
 * the whole request checked by the server's schema (its rules across fields, such as the year range). Messages sit
 * at the form's field paths (filters.yearTo, dependence.r, level …).
 */
export const synthesisFormSchema = formValuesSchema.transform((v) => candidateFromRead(v as ReadValues)).pipe(synthesisRequestSchema);
