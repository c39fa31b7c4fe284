import MiniSearch from 'minisearch';
import { MeiliError } from './errors.js';
import { buildFilter, getPath } from './filter.js';
import { fold, type Doc, type Settings } from './documents.js';

/** One index kept in memory: its documents (in insertion order), settings and a minisearch over them. */
export class FakeIndex {
  docs = new Map<string, Doc>();
  settings: Settings = { searchableAttributes: ['*'], filterableAttributes: [], sortableAttributes: [], displayedAttributes: ['*'] };
  mini!: MiniSearch<Doc>;
  readonly createdAt = new Date().toISOString();
  updatedAt = this.createdAt;

  constructor(
    readonly uid: string,
    public primaryKey: string | null,
  ) {
    this.rebuild();
  }

  private fields(): string[] {
    return this.settings.searchableAttributes.includes('*') ? ['_all'] : this.settings.searchableAttributes;
  }

  rebuild() {
    const fields = this.fields();
    this.mini = new MiniSearch<Doc>({
      idField: '_key',
      fields,
      storeFields: [],
      extractField: (doc, field) => {
        if (field === '_key') return doc._key as string;
        const text = (v: unknown): string => (v == null ? '' : Array.isArray(v) ? v.map(text).join(' ') : typeof v === 'object' ? '' : String(v));
        if (field === '_all') return Object.entries(doc).filter(([k]) => k !== '_key').map(([, v]) => text(v)).join(' ');
        return text(doc[field]);
      },
      processTerm: (term) => fold(term),
    });
    const keyed = [...this.docs.entries()].map(([k, d]) => ({ ...d, _key: k }));
    this.mini.addAll(keyed);
  }

  key(doc: Doc): string {
    if (!this.primaryKey) {
      const guess = Object.keys(doc).find((k) => /id$/i.test(k));
      if (!guess) throw new MeiliError(400, 'index_primary_key_no_candidate_found', 'The primary key inference failed: no attribute ends with "id".');
      this.primaryKey = guess;
    }
    const v = doc[this.primaryKey];
    if (v === undefined || v === null || (typeof v !== 'string' && typeof v !== 'number')) {
      throw new MeiliError(400, 'missing_document_id', `Document doesn't have a \`${this.primaryKey}\` attribute: \`${JSON.stringify(doc).slice(0, 200)}\`.`);
    }
    return String(v);
  }

  put(docs: Doc[], merge: boolean) {
    for (const raw of docs) {
      const k = this.key(raw);
      const prev = this.docs.get(k);
      const doc = merge && prev ? { ...prev, ...raw } : raw;
      if (prev) this.mini.replace({ ...doc, _key: k });
      else this.mini.add({ ...doc, _key: k });
      this.docs.set(k, doc);
    }
    this.updatedAt = new Date().toISOString();
  }

  remove(keys: string[]) {
    let n = 0;
    for (const k of keys) {
      if (!this.docs.has(k)) continue;
      this.mini.discard(k);
      this.docs.delete(k);
      n++;
    }
    this.updatedAt = new Date().toISOString();
    return n;
  }

  /** Insertion order (a Map keeps it), which is what a placeholder search (empty q) returns. */
  liveOrder(): string[] {
    return [...this.docs.keys()];
  }
}

export interface SearchParams {
  q?: unknown;
  limit?: unknown;
  offset?: unknown;
  filter?: unknown;
  facets?: unknown;
  sort?: unknown;
  attributesToRetrieve?: unknown;
}

/** A search as Meilisearch answers it: q, filter, facets, sort, limit, offset and attributesToRetrieve. */
export function searchIndex(idx: FakeIndex, params: SearchParams) {
  const started = performance.now();
  const q = typeof params.q === 'string' ? params.q : '';
  const limit = Math.max(0, Number(params.limit ?? 20));
  const offset = Math.max(0, Number(params.offset ?? 0));
  const pred = buildFilter(params.filter, idx.settings.filterableAttributes);
  const facetNames: string[] = Array.isArray(params.facets) ? params.facets : [];
  for (const f of facetNames) {
    if (!idx.settings.filterableAttributes.includes(f)) {
      throw new MeiliError(400, 'invalid_search_facets', `Attribute \`${f}\` is not filterable. Available filterable attributes are: \`${idx.settings.filterableAttributes.join(', ')}\`.`);
    }
  }
  const sortRules: Array<{ attr: string; sign: number }> = Array.isArray(params.sort)
    ? params.sort.map((s: string) => {
        const [attr, dir] = String(s).split(':');
        if (!idx.settings.sortableAttributes.includes(attr)) {
          throw new MeiliError(400, 'invalid_search_sort', `Attribute \`${attr}\` is not sortable. Available sortable attributes are: \`${idx.settings.sortableAttributes.join(', ')}\`.`);
        }
        return { attr, sign: dir === 'desc' ? -1 : 1 };
      })
    : [];
  // One pass over the candidates: filter, count facets, keep the matches (in rank or insertion order).
  const facetCounts: Array<Record<string, number>> = facetNames.map(() => ({}));
  let docs: Doc[] = [];
  const consider = (d: Doc | undefined) => {
    if (!d || (pred && !pred(d))) return;
    docs.push(d);
    for (let i = 0; i < facetNames.length; i++) {
      const v = getPath(d, facetNames[i]);
      const counts = facetCounts[i];
      if (Array.isArray(v)) {
        for (const x of v) if (x !== null && x !== undefined) counts[String(x)] = (counts[String(x)] ?? 0) + 1;
      } else if (v !== null && v !== undefined) counts[String(v)] = (counts[String(v)] ?? 0) + 1;
    }
  };
  if (q.trim()) {
    // All words must match; the last word may be a prefix; longer words tolerate a typo.
    const results = idx.mini.search(q, {
      combineWith: 'AND',
      prefix: (_term, i, terms) => i === terms.length - 1,
      fuzzy: (term) => (term.length >= 5 ? 1 : 0),
      maxFuzzy: 1,
    });
    for (const r of results) consider(idx.docs.get(r.id as string));
  } else for (const d of idx.docs.values()) consider(d);
  if (sortRules.length) {
    docs = [...docs].sort((a, b) => {
      for (const { attr, sign } of sortRules) {
        const x = getPath(a, attr) as string | number | null | undefined;
        const y = getPath(b, attr) as string | number | null | undefined;
        if (x === y) continue;
        if (x === undefined || x === null) return 1;
        if (y === undefined || y === null) return -1;
        return (x < y ? -1 : 1) * sign;
      }
      return 0;
    });
  }
  const facetDistribution = facetNames.length ? Object.fromEntries(facetNames.map((f, i) => [f, facetCounts[i]])) : undefined;
  const retrieve: string[] | undefined = Array.isArray(params.attributesToRetrieve) && !params.attributesToRetrieve.includes('*') ? params.attributesToRetrieve : undefined;
  const hits = docs.slice(offset, offset + limit).map((d) => (retrieve ? Object.fromEntries(retrieve.filter((a) => a in d).map((a) => [a, d[a]])) : d));
  return {
    hits,
    query: q,
    processingTimeMs: Math.round(performance.now() - started),
    limit,
    offset,
    estimatedTotalHits: docs.length,
    ...(facetDistribution ? { facetDistribution, facetStats: {} } : {}),
  };
}
