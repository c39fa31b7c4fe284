/**
 * Every query key of the client, one factory per domain: all → lists → list(filters) → detail(id).
 * Invalidating a prefix invalidates everything below it, so a mutation names the widest key it changed.
 */
type Id = number | string;

function domain<const N extends string>(name: N) {
  const all = [name] as const;
  return {
    all,
    lists: () => [...all, 'list'] as const,
    list: (filters: object) => [...all, 'list', filters] as const,
    details: () => [...all, 'detail'] as const,
    detail: (id: Id) => [...all, 'detail', id] as const,
  };
}

const auth = domain('auth');
const users = domain('users');
const audit = domain('audit');
const tokens = domain('tokens');
const references = domain('references');
const duplicates = domain('duplicates');
const imports = domain('imports');
const screening = domain('screening');
const search = domain('search');
const extractions = domain('extractions');
const records = domain('records');
const assignments = domain('assignments');
const reconciliation = domain('reconciliation');
const agreement = domain('agreement');
const manipulations = domain('manipulations');
const effects = domain('effects');
const atlas = domain('atlas');
const synthesis = domain('syntheses');
const snapshots = domain('snapshots');
const mail = domain('mail');
const trials = domain('trials');
const follows = domain('follows');

export const queryKeys = {
  auth: { ...auth, me: () => [...auth.all, 'me'] as const },
  users,
  audit,
  tokens,
  follows: {
    ...follows,
    /** "what changed since": a follow's results then and now, which move with the registry */
    changesAll: () => [...follows.all, 'changes'] as const,
    changes: (id: number, since: number | undefined) => [...follows.all, 'changes', id, { since }] as const,
  },
  mail: {
    ...mail,
    /** The delivery log is the domain's list; the mailbox (what the mail catcher received) sits beside it. */
    mailboxes: () => [...mail.all, 'mailbox'] as const,
    mailbox: (filters: object) => [...mail.all, 'mailbox', filters] as const,
  },
  references,
  duplicates,
  imports: { ...imports, entries: (id: number, filters: object) => [...imports.detail(id), 'entries', filters] as const },
  screening: { ...screening, counts: () => [...screening.all, 'counts'] as const },
  search,
  extractions: { ...extractions, claimable: (filters: object) => [...extractions.all, 'claimable', filters] as const },
  /** Settled records (and their version history per reference). */
  records: { ...records, histories: () => [...records.all, 'history'] as const, history: (referenceId: number) => [...records.all, 'history', referenceId] as const },
  assignments: {
    ...assignments,
    candidates: (filters: object) => [...assignments.all, 'candidates', filters] as const,
    coders: () => [...assignments.all, 'coders'] as const,
  },
  /** The queue is the list; a pair (two codings of one assignment) is the detail. */
  reconciliation,
  agreement: {
    ...agreement,
    overall: () => [...agreement.all, 'overall'] as const,
    references: (filters: object) => [...agreement.all, 'references', filters] as const,
  },
  manipulations,
  effects,
  atlas: {
    ...atlas,
    landing: () => [...atlas.all, 'landing'] as const,
    manipulations: () => [...atlas.all, 'manipulation'] as const,
    manipulation: (term: string) => [...atlas.all, 'manipulation', term] as const,
    outcomes: () => [...atlas.all, 'outcome'] as const,
    outcome: (kind: string) => [...atlas.all, 'outcome', kind] as const,
    references: (scope: 'manipulations' | 'outcomes', slug: string, filters: object) => [...atlas.all, 'references', scope, slug, filters] as const,
  },
  synthesis: {
    ...synthesis,
    facets: () => [...synthesis.all, 'facets'] as const,
    runs: () => [...synthesis.all, 'run'] as const,
    run: (request: object) => [...synthesis.all, 'run', request] as const,
    rows: (request: object, paging: object) => [...synthesis.all, 'rows', request, paging] as const,
  },
  /** Trial data sets: a sheet's list, one set with its fits, and the effect two of its conditions give. */
  trials: {
    ...trials,
    ofSheet: (extractionId: number) => [...trials.lists(), { extractionId }] as const,
    contrast: (setId: number, request: object) => [...trials.detail(setId), 'contrast', request] as const,
  },
  snapshots: {
    ...snapshots,
    /** A frozen snapshot never changes; only its comparison with today's registry does. */
    diffs: () => [...snapshots.all, 'diff'] as const,
    diff: (id: string) => [...snapshots.all, 'diff', id] as const,
  },
};
