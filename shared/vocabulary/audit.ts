import { ROLE_LABELS, type Role } from '../roles.js';
import { LABELS, labelOf } from './labels.js';

/** Keys of audit details that name another record by its id: said "reference 12". */
const RECORD_KEYS: Record<string, string> = {
  referenceId: 'reference',
  assignmentId: 'pair',
  recordId: 'settled record',
  extractionId: 'coding sheet',
  newVersionId: 'new version',
  undoneDecision: 'decision',
  attachment: 'attachment',
  candidate: 'duplicate candidate',
  kept: 'kept reference',
  merged: 'merged reference',
  mintedByTokenId: 'minted with token',
};

/** Keys said in other words than their split name. */
const KEY_WORDS: Record<string, string> = {
  k: 'studies',
  previous: 'before',
  now: 'now',
  previousStatus: 'status before',
  alsoRevoked: 'tokens also revoked',
  withdrawnRecords: 'records withdrawn',
  restoredRecords: 'records restored',
  recordVersion: 'record version',
  registryVersion: 'registry version',
  mergedTitle: 'merged title',
  mergedDoi: 'merged DOI',
  doi: 'DOI',
  path: 'field',
  coder1Id: 'first coder',
  coder2Id: 'second coder',
  reconcilerId: 'reconciler',
};

/** Values of these keys are codes with labels. */
const CODED: Record<string, (v: string) => string> = {
  role: (v) => ROLE_LABELS[v as Role] ?? v,
  decision: (v) => labelOf('screening', v),
  previous: (v) => labelOf('screening', v),
  now: (v) => labelOf('screening', v),
  reason: (v) => (LABELS.exclusionReason as Record<string, string>)[v] ?? v,
  previousStatus: (v) => labelOf('state', v),
  status: (v) => labelOf('state', v),
  state: (v) => labelOf('state', v),
  metric: (v) => labelOf('metric', v),
  outcome: (v) => labelOf('outcome', v),
  manipulation: (v) => labelOf('manipulation', v),
  parameter: (v) => labelOf('parameter', v),
  unit: (v) => labelOf('unit', v),
  format: (v) => ({ bibtex: 'BibTeX', ris: 'RIS', doi: 'DOI list', csv: 'CSV', trials: 'trials', counts: 'counts' })[v] ?? v,
  resolution: (v) => ({ a: 'coder A', b: 'coder B', value: 'the curator’s own value' })[v] ?? v,
  method: (v) => ({ DL: 'DerSimonian–Laird', REML: 'REML', PM: 'Paule–Mandel', FE: 'Fixed effect' })[v] ?? v,
};

const keyWords = (k: string) => KEY_WORDS[k] ?? RECORD_KEYS[k] ?? k.replace(/([a-z])([A-Z0-9])/g, '$1 $2').replace(/_/g, ' ').toLowerCase();

function valueText(key: string, v: unknown): string | null {
  if (v === null || v === undefined || v === '') return null;
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (typeof v === 'number') return String(v);
  if (typeof v === 'string') return CODED[key] ? CODED[key](v) : v;
  if (Array.isArray(v)) {
    const items = v.map((x) => valueText(key, x)).filter((x): x is string => x !== null);
    return items.length ? items.join(', ') : 'none';
  }
  if (typeof v === 'object') {
    const inner = auditDetailsText(v as Record<string, unknown>);
    return inner ? `(${inner})` : null;
  }
  return String(v);
}

/**
 * An audit entry's details as text for people ("role: Curator; login: dario"), never JSON: keys in words,
 * record ids as "reference 12", coded values by their labels; empty values left out.
 */
export function auditDetailsText(details: Record<string, unknown>): string {
  const parts: string[] = [];
  for (const [k, v] of Object.entries(details)) {
    const text = valueText(k, v);
    if (text === null) continue;
    if (RECORD_KEYS[k] && typeof v === 'number') parts.push(`${RECORD_KEYS[k]} ${v}`);
    else parts.push(`${keyWords(k)}: ${text}`);
  }
  return parts.join('; ');
}

/** What an audit entry is about in words ("Reference 12"). */
export function auditRecordText(entityType: string, entityId: string | null): string {
  return `${labelOf('record', entityType)}${entityId ? ` ${entityId}` : ''}`;
}
