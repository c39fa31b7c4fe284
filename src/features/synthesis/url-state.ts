import { synthesisRequestSchema, type SynthesisRequest } from '../../../shared/schemas/synthesis';

/** The synthesis form's fields as the inputs hold them (strings until parsed). */
export interface SynthesisForm {
  manipulation: string[];
  outcome: string;
  metric: string;
  population: string;
  modality: string;
  task: string;
  design: string;
  yearFrom: string;
  yearTo: string;
  method: string;
  hksj: boolean;
  level: string;
  depMode: 'aggregate' | 'one';
  r: string;
  rule: string;
  subgroup: string;
  moderator: string;
}

export const EMPTY_FORM: SynthesisForm = {
  manipulation: [],
  outcome: '',
  metric: '',
  population: '',
  modality: '',
  task: '',
  design: '',
  yearFrom: '',
  yearTo: '',
  method: 'DL',
  hksj: false,
  level: '0.95',
  depMode: 'aggregate',
  r: '0.5',
  rule: 'largest_n',
  subgroup: '',
  moderator: '',
};

const FILTER_KEYS = ['outcome', 'metric', 'population', 'modality', 'task', 'design'] as const;

export function formFromParams(p: URLSearchParams): SynthesisForm {
  const f: SynthesisForm = { ...EMPTY_FORM, manipulation: p.getAll('manipulation') };
  for (const k of FILTER_KEYS) f[k] = p.get(k) ?? '';
  f.yearFrom = p.get('yearFrom') ?? '';
  f.yearTo = p.get('yearTo') ?? '';
  f.method = p.get('method') ?? 'DL';
  f.hksj = p.get('hksj') === '1';
  f.level = p.get('level') ?? '0.95';
  f.depMode = p.get('dependence') === 'one' ? 'one' : 'aggregate';
  f.r = p.get('r') ?? '0.5';
  f.rule = p.get('rule') ?? 'largest_n';
  f.subgroup = p.get('subgroup') ?? '';
  f.moderator = p.get('moderator') ?? '';
  return f;
}

export function paramsFromForm(f: SynthesisForm): URLSearchParams {
  const p = new URLSearchParams();
  for (const m of f.manipulation) p.append('manipulation', m);
  for (const k of FILTER_KEYS) if (f[k]) p.set(k, f[k]);
  if (f.yearFrom) p.set('yearFrom', f.yearFrom);
  if (f.yearTo) p.set('yearTo', f.yearTo);
  p.set('method', f.method);
  if (f.hksj) p.set('hksj', '1');
  if (f.level !== '0.95') p.set('level', f.level);
  p.set('dependence', f.depMode);
  if (f.depMode === 'aggregate') p.set('r', f.r);
  else p.set('rule', f.rule);
  if (f.subgroup) p.set('subgroup', f.subgroup);
  if (f.moderator) p.set('moderator', f.moderator);
  return p;
}

const num = (s: string) => (s.trim() === '' ? undefined : Number(s));

/** Parses the form with the same schema the server uses; field messages keyed like the form's fields. */
export function requestFromForm(f: SynthesisForm): { request: SynthesisRequest | null; errors: Record<string, string> } {
  const filters: Record<string, unknown> = {};
  if (f.manipulation.length) filters.manipulation = f.manipulation.length === 1 ? f.manipulation[0] : f.manipulation;
  for (const k of FILTER_KEYS) if (f[k]) filters[k] = f[k];
  if (f.yearFrom.trim()) filters.yearFrom = num(f.yearFrom);
  if (f.yearTo.trim()) filters.yearTo = num(f.yearTo);
  const candidate = {
    filters,
    method: f.method,
    hksj: f.hksj,
    level: num(f.level),
    dependence: f.depMode === 'aggregate' ? { mode: 'aggregate', r: num(f.r) } : { mode: 'one', rule: f.rule },
    ...(f.subgroup ? { subgroup: f.subgroup } : {}),
    ...(f.moderator ? { moderator: f.moderator } : {}),
  };
  const parsed = synthesisRequestSchema.safeParse(candidate);
  if (parsed.success) return { request: parsed.data, errors: {} };
  const errors: Record<string, string> = {};
  for (const issue of parsed.error.issues) {
    const path = issue.path.map(String);
    const key = path[0] === 'filters' ? path[1] : path[0] === 'dependence' ? (path[1] === 'r' ? 'r' : 'rule') : path[0];
    errors[key ?? 'form'] ??= issue.message;
  }
  return { request: null, errors };
}
