import express, { type Request, type Response } from 'express';
import type { Server } from 'node:http';
import MiniSearch from 'minisearch';

/**
 * A loopback stand-in for a Meilisearch server: the part of its HTTP API the `meilisearch` 0.62 client
 * uses (health, indexes, settings, documents add/replace/update/delete, search with q, filter, facets,
 * sort, limit and offset, tasks), kept in memory and searched with minisearch. Tasks finish before the
 * request that enqueued them answers, so `waitTask()` returns on its first poll.
 */

type Doc = Record<string, unknown>;
type Settings = {
  searchableAttributes: string[];
  filterableAttributes: string[];
  sortableAttributes: string[];
  displayedAttributes: string[];
  [k: string]: unknown;
};

interface Task {
  uid: number;
  batchUid: number;
  indexUid: string | null;
  status: 'enqueued' | 'processing' | 'succeeded' | 'failed' | 'canceled';
  type: string;
  canceledBy: null;
  details: Record<string, unknown>;
  error: null | { message: string; code: string; type: string; link: string };
  duration: string | null;
  enqueuedAt: string;
  startedAt: string | null;
  finishedAt: string | null;
}

class MeiliError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly type = 'invalid_request',
  ) {
    super(message);
  }
}

const fold = (s: string) =>
  s
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase();

class FakeIndex {
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

// ---- filter expressions: the subset of Meilisearch's syntax (=, !=, >, >=, <, <=, TO, IN, NOT, AND, OR, EXISTS, IS NULL, parentheses)

type Pred = (doc: Doc) => boolean;
type Token = { t: 'word' | 'str' | 'op' | 'lp' | 'rp' | 'lb' | 'rb' | 'comma'; v: string };

function tokenize(src: string): Token[] {
  const out: Token[] = [];
  let i = 0;
  while (i < src.length) {
    const c = src[i];
    if (/\s/.test(c)) {
      i++;
    } else if (c === '(' || c === ')' || c === '[' || c === ']' || c === ',') {
      out.push({ t: c === '(' ? 'lp' : c === ')' ? 'rp' : c === '[' ? 'lb' : c === ']' ? 'rb' : 'comma', v: c });
      i++;
    } else if (c === '"' || c === "'") {
      let j = i + 1;
      let s = '';
      while (j < src.length && src[j] !== c) {
        if (src[j] === '\\' && j + 1 < src.length) j++;
        s += src[j++];
      }
      if (j >= src.length) throw new MeiliError(400, 'invalid_search_filter', `Unterminated string in filter at position ${i}.`);
      out.push({ t: 'str', v: s });
      i = j + 1;
    } else if (/[=!<>]/.test(c)) {
      const two = src.slice(i, i + 2);
      if (two === '!=' || two === '>=' || two === '<=') {
        out.push({ t: 'op', v: two });
        i += 2;
      } else if (c === '=' || c === '<' || c === '>') {
        out.push({ t: 'op', v: c });
        i++;
      } else throw new MeiliError(400, 'invalid_search_filter', `Unexpected "${c}" in filter at position ${i}.`);
    } else {
      let j = i;
      while (j < src.length && !/[\s()[\],=!<>"']/.test(src[j])) j++;
      out.push({ t: 'word', v: src.slice(i, j) });
      i = j;
    }
  }
  return out;
}

const asNumber = (v: unknown) => (typeof v === 'number' ? v : typeof v === 'string' && v.trim() !== '' && !Number.isNaN(Number(v)) ? Number(v) : NaN);
const getPath = (doc: Doc, attr: string): unknown => (attr.includes('.') ? attr.split('.').reduce<unknown>((o, k) => (o && typeof o === 'object' ? (o as Doc)[k] : undefined), doc) : doc[attr]);
const NON_ASCII = /[^\u0020-\u007e]/;

/** A test "attribute value equals v", with v's forms worked out once (filters run over every document). */
function equalsTo(v: string): (a: unknown) => boolean {
  const n = asNumber(v);
  const low = v.toLowerCase();
  const folded = fold(v);
  const bool = low === 'true' ? true : low === 'false' ? false : null;
  return (a) => {
    if (a === null || a === undefined) return false;
    if (typeof a === 'number') return a === n;
    if (typeof a === 'boolean') return a === bool;
    const s = typeof a === 'string' ? a : String(a);
    if (s === v) return true;
    const sl = s.toLowerCase();
    return sl === low || (NON_ASCII.test(s) || NON_ASCII.test(v) ? fold(s) === folded : false);
  };
}

function compareTo(op: string, b: string): (a: unknown) => boolean {
  const y = asNumber(b);
  if (Number.isNaN(y)) return () => false;
  return (a) => {
    const x = typeof a === 'number' ? a : asNumber(a);
    if (Number.isNaN(x)) return false;
    return op === '>' ? x > y : op === '>=' ? x >= y : op === '<' ? x < y : x <= y;
  };
}

/** Whether any value of the attribute (one value, or each element of an array) passes. */
const anyOf = (attr: string, test: (a: unknown) => boolean) => (d: Doc) => {
  const v = getPath(d, attr);
  if (Array.isArray(v)) return v.some(test);
  return v !== undefined && test(v);
};

function parseFilter(src: string, filterable: string[]): Pred {
  const toks = tokenize(src);
  let p = 0;
  const peek = () => toks[p];
  const isWord = (w: string) => peek()?.t === 'word' && peek().v.toUpperCase() === w;
  const fail = (msg: string): never => {
    throw new MeiliError(400, 'invalid_search_filter', `${msg} (in filter \`${src}\`).`);
  };
  const value = (): string => {
    const t = toks[p++];
    if (!t || (t.t !== 'word' && t.t !== 'str')) fail('Expected a value');
    return t.v;
  };
  const checkAttr = (attr: string) => {
    if (!filterable.includes(attr)) {
      fail(`Attribute \`${attr}\` is not filterable. Available filterable attributes are: \`${filterable.join(', ')}\``);
    }
  };
  const condition = (): Pred => {
    const t = toks[p++];
    if (!t || (t.t !== 'word' && t.t !== 'str')) fail('Expected an attribute');
    const attr = t.v;
    checkAttr(attr);
    if (isWord('EXISTS')) {
      p++;
      return (d) => getPath(d, attr) !== undefined;
    }
    if (isWord('IS')) {
      p++;
      const neg = isWord('NOT') ? (p++, true) : false;
      if (!isWord('NULL') && !isWord('EMPTY')) fail('Expected NULL or EMPTY after IS');
      const kind = toks[p++].v.toUpperCase();
      const test: Pred =
        kind === 'NULL'
          ? (d) => getPath(d, attr) === null
          : (d) => {
              const v = getPath(d, attr);
              return v === '' || (Array.isArray(v) && v.length === 0) || (typeof v === 'object' && v !== null && !Array.isArray(v) && Object.keys(v).length === 0);
            };
      return neg ? (d) => !test(d) : test;
    }
    let negIn = false;
    if (isWord('NOT')) {
      p++;
      if (isWord('EXISTS')) {
        p++;
        return (d) => getPath(d, attr) === undefined;
      }
      negIn = true;
      if (!isWord('IN')) fail('Expected IN or EXISTS after NOT');
    }
    if (isWord('IN')) {
      p++;
      if (peek()?.t !== 'lb') fail('Expected [ after IN');
      p++;
      const list: string[] = [];
      while (peek() && peek().t !== 'rb') {
        list.push(value());
        if (peek()?.t === 'comma') p++;
      }
      if (peek()?.t !== 'rb') fail('Expected ] to close IN');
      p++;
      const tests = list.map(equalsTo);
      const test: Pred = anyOf(attr, (v) => tests.some((t) => t(v)));
      return negIn ? (d) => !test(d) : test;
    }
    const op = peek();
    if (op?.t === 'op') {
      p++;
      const v = value();
      if (op.v === '=') return anyOf(attr, equalsTo(v));
      if (op.v === '!=') {
        const eq = anyOf(attr, equalsTo(v));
        return (d) => !eq(d);
      }
      return anyOf(attr, compareTo(op.v, v));
    }
    // "attr low TO high"
    const low = value();
    if (!isWord('TO')) fail(`Expected an operator after \`${attr}\``);
    p++;
    const high = value();
    const ge = compareTo('>=', low);
    const le = compareTo('<=', high);
    return anyOf(attr, (x) => ge(x) && le(x));
  };
  const primary = (): Pred => {
    if (isWord('NOT')) {
      p++;
      const inner = primary();
      return (d) => !inner(d);
    }
    if (peek()?.t === 'lp') {
      p++;
      const inner = or();
      if (peek()?.t !== 'rp') fail('Expected )');
      p++;
      return inner;
    }
    return condition();
  };
  const and = (): Pred => {
    const parts = [primary()];
    while (isWord('AND')) {
      p++;
      parts.push(primary());
    }
    return parts.length === 1 ? parts[0] : (d) => parts.every((f) => f(d));
  };
  const or = (): Pred => {
    const parts = [and()];
    while (isWord('OR')) {
      p++;
      parts.push(and());
    }
    return parts.length === 1 ? parts[0] : (d) => parts.some((f) => f(d));
  };
  if (!toks.length) return () => true;
  const pred = or();
  if (p < toks.length) fail(`Unexpected \`${toks[p].v}\``);
  return pred;
}

/** A filter as the client sends it: a string, or an array (AND) whose nested arrays are ORs. */
function buildFilter(filter: unknown, filterable: string[]): Pred | null {
  if (filter === undefined || filter === null || filter === '') return null;
  if (typeof filter === 'string') return parseFilter(filter, filterable);
  if (Array.isArray(filter)) {
    const parts = filter.map((f) => {
      if (Array.isArray(f)) {
        const ors = f.map((g) => buildFilter(g, filterable)).filter(Boolean) as Pred[];
        return (d: Doc) => ors.some((o) => o(d));
      }
      return buildFilter(f, filterable) ?? (() => true);
    });
    return (d) => parts.every((f) => f(d));
  }
  throw new MeiliError(400, 'invalid_search_filter', 'Invalid syntax for the filter parameter: expected a string or an array.');
}

export function createSearchIndexServer() {
  const indexes = new Map<string, FakeIndex>();
  const tasks = new Map<number, Task>();
  let nextTask = 0;
  const app = express();
  app.use(express.json({ limit: '200mb', type: () => true }));

  const link = (code: string) => `https://docs.meilisearch.com/errors#${code}`;
  const sendError = (res: Response, err: unknown) => {
    if (err instanceof MeiliError) {
      res.status(err.status).json({ message: err.message, code: err.code, type: err.type, link: link(err.code) });
    } else {
      res.status(500).json({ message: String((err as Error)?.message ?? err), code: 'internal', type: 'internal', link: link('internal') });
    }
  };
  const wrap = (fn: (req: Request, res: Response) => void) => (req: Request, res: Response) => {
    try {
      fn(req, res);
    } catch (err) {
      sendError(res, err);
    }
  };

  const getIndex = (uid: string) => {
    const idx = indexes.get(uid);
    if (!idx) throw new MeiliError(404, 'index_not_found', `Index \`${uid}\` not found.`);
    return idx;
  };
  const ensureIndex = (uid: string, primaryKey?: string | null) => {
    let idx = indexes.get(uid);
    if (!idx) {
      if (!/^[A-Za-z0-9_-]{1,400}$/.test(uid)) throw new MeiliError(400, 'invalid_index_uid', `\`${uid}\` is not a valid index uid.`);
      idx = new FakeIndex(uid, primaryKey ?? null);
      indexes.set(uid, idx);
    } else if (primaryKey && !idx.primaryKey) idx.primaryKey = primaryKey;
    return idx;
  };

  /** Runs the work now and records the task as the real server would after processing it. */
  const enqueue = (res: Response, indexUid: string | null, type: string, work: () => Record<string, unknown>) => {
    const uid = nextTask++;
    const enqueuedAt = new Date().toISOString();
    const task: Task = {
      uid,
      batchUid: uid,
      indexUid,
      status: 'enqueued',
      type,
      canceledBy: null,
      details: {},
      error: null,
      duration: null,
      enqueuedAt,
      startedAt: null,
      finishedAt: null,
    };
    const started = performance.now();
    task.startedAt = new Date().toISOString();
    try {
      task.details = work();
      task.status = 'succeeded';
    } catch (err) {
      task.status = 'failed';
      const e = err instanceof MeiliError ? err : new MeiliError(500, 'internal', String((err as Error).message));
      task.error = { message: e.message, code: e.code, type: e.type, link: link(e.code) };
    }
    task.finishedAt = new Date().toISOString();
    task.duration = `PT${((performance.now() - started) / 1000).toFixed(6)}S`;
    tasks.set(uid, task);
    // Keep memory bounded in long development sessions.
    if (tasks.size > 10_000) tasks.delete(uid - 10_000);
    res.status(202).json({ taskUid: uid, indexUid, status: 'enqueued', type, enqueuedAt });
  };

  app.get('/health', (_req, res) => {
    res.json({ status: 'available' });
  });
  app.get('/version', (_req, res) => {
    res.json({ pkgVersion: 'fake', commitSha: 'local', commitDate: new Date(0).toISOString() });
  });

  app.get(
    '/tasks/:uid',
    wrap((req, res) => {
      const task = tasks.get(Number(req.params.uid));
      if (!task) throw new MeiliError(404, 'task_not_found', `Task \`${req.params.uid}\` not found.`);
      res.json(task);
    }),
  );
  app.get('/tasks', (req, res) => {
    const limit = Math.min(Number(req.query.limit ?? 20) || 20, 1000);
    const all = [...tasks.values()].reverse().slice(0, limit);
    res.json({ results: all, total: tasks.size, limit, from: all[0]?.uid ?? null, next: null });
  });

  const indexView = (i: FakeIndex) => ({ uid: i.uid, primaryKey: i.primaryKey, createdAt: i.createdAt, updatedAt: i.updatedAt });
  app.get('/indexes', (_req, res) => {
    const results = [...indexes.values()].map(indexView);
    res.json({ results, offset: 0, limit: 20, total: results.length });
  });
  app.post(
    '/indexes',
    wrap((req, res) => {
      const { uid, primaryKey } = req.body ?? {};
      if (typeof uid !== 'string') throw new MeiliError(400, 'missing_index_uid', 'Missing field `uid`.');
      enqueue(res, uid, 'indexCreation', () => {
        if (indexes.has(uid)) throw new MeiliError(409, 'index_already_exists', `Index \`${uid}\` already exists.`);
        ensureIndex(uid, primaryKey ?? null);
        return { primaryKey: primaryKey ?? null };
      });
    }),
  );
  app.get(
    '/indexes/:uid',
    wrap((req, res) => {
      res.json(indexView(getIndex(String(req.params.uid))));
    }),
  );
  app.delete(
    '/indexes/:uid',
    wrap((req, res) => {
      const uid = String(req.params.uid);
      enqueue(res, uid, 'indexDeletion', () => {
        const idx = getIndex(uid);
        indexes.delete(uid);
        return { deletedDocuments: idx.docs.size };
      });
    }),
  );
  app.get(
    '/indexes/:uid/stats',
    wrap((req, res) => {
      const idx = getIndex(String(req.params.uid));
      res.json({ numberOfDocuments: idx.docs.size, isIndexing: false, fieldDistribution: {} });
    }),
  );

  // Settings: the whole object, or one setting by its kebab-case name.
  const camel = (s: string) => s.replace(/-([a-z])/g, (_m, c: string) => c.toUpperCase());
  app.get(
    '/indexes/:uid/settings',
    wrap((req, res) => {
      res.json(getIndex(String(req.params.uid)).settings);
    }),
  );
  const applySettings = (uid: string, patch: Record<string, unknown>) => {
    const idx = ensureIndex(uid);
    const before = JSON.stringify(idx.settings.searchableAttributes);
    for (const [k, v] of Object.entries(patch)) {
      if (v === null) {
        if (k in { searchableAttributes: 1, displayedAttributes: 1 }) idx.settings[k] = ['*'];
        else if (k in { filterableAttributes: 1, sortableAttributes: 1 }) idx.settings[k] = [];
        else delete idx.settings[k];
      } else idx.settings[k] = v;
    }
    if (JSON.stringify(idx.settings.searchableAttributes) !== before) idx.rebuild();
    return patch;
  };
  app.patch(
    '/indexes/:uid/settings',
    wrap((req, res) => {
      const uid = String(req.params.uid);
      enqueue(res, uid, 'settingsUpdate', () => applySettings(uid, req.body ?? {}));
    }),
  );
  app.get(
    '/indexes/:uid/settings/:name',
    wrap((req, res) => {
      res.json(getIndex(String(req.params.uid)).settings[camel(String(req.params.name))] ?? null);
    }),
  );
  for (const method of ['put', 'patch'] as const) {
    app[method](
      '/indexes/:uid/settings/:name',
      wrap((req, res) => {
        const uid = String(req.params.uid);
        enqueue(res, uid, 'settingsUpdate', () => applySettings(uid, { [camel(String(req.params.name))]: req.body }));
      }),
    );
  }

  // Documents.
  const addDocs = (merge: boolean) =>
    wrap((req, res) => {
      const uid = String(req.params.uid);
      const body = req.body;
      const docs: Doc[] = Array.isArray(body) ? body : body && typeof body === 'object' ? [body] : [];
      if (!Array.isArray(body) && !(body && typeof body === 'object')) throw new MeiliError(400, 'malformed_payload', 'The payload must be a JSON array of documents.');
      const pk = typeof req.query.primaryKey === 'string' ? req.query.primaryKey : null;
      enqueue(res, uid, 'documentAdditionOrUpdate', () => {
        const idx = ensureIndex(uid, pk);
        idx.put(docs, merge);
        return { receivedDocuments: docs.length, indexedDocuments: docs.length };
      });
    });
  app.post('/indexes/:uid/documents', addDocs(false));
  app.put('/indexes/:uid/documents', addDocs(true));
  app.get(
    '/indexes/:uid/documents',
    wrap((req, res) => {
      const idx = getIndex(String(req.params.uid));
      const limit = Number(req.query.limit ?? 20);
      const offset = Number(req.query.offset ?? 0);
      const keys = idx.liveOrder();
      res.json({ results: keys.slice(offset, offset + limit).map((k) => idx.docs.get(k)), offset, limit, total: keys.length });
    }),
  );
  app.get(
    '/indexes/:uid/documents/:id',
    wrap((req, res) => {
      const doc = getIndex(String(req.params.uid)).docs.get(String(req.params.id));
      if (!doc) throw new MeiliError(404, 'document_not_found', `Document \`${req.params.id}\` not found.`);
      res.json(doc);
    }),
  );
  app.delete(
    '/indexes/:uid/documents/:id',
    wrap((req, res) => {
      const uid = String(req.params.uid);
      enqueue(res, uid, 'documentDeletion', () => ({ providedIds: 1, deletedDocuments: getIndex(uid).remove([String(req.params.id)]) }));
    }),
  );
  app.delete(
    '/indexes/:uid/documents',
    wrap((req, res) => {
      const uid = String(req.params.uid);
      enqueue(res, uid, 'documentDeletion', () => {
        const idx = getIndex(uid);
        return { deletedDocuments: idx.remove([...idx.docs.keys()]) };
      });
    }),
  );
  app.post(
    '/indexes/:uid/documents/delete-batch',
    wrap((req, res) => {
      const uid = String(req.params.uid);
      const ids = Array.isArray(req.body) ? req.body.map(String) : [];
      enqueue(res, uid, 'documentDeletion', () => ({ providedIds: ids.length, deletedDocuments: ensureIndex(uid).remove(ids) }));
    }),
  );
  app.post(
    '/indexes/:uid/documents/delete',
    wrap((req, res) => {
      const uid = String(req.params.uid);
      enqueue(res, uid, 'documentDeletion', () => {
        const idx = getIndex(uid);
        const pred = buildFilter(req.body?.filter, idx.settings.filterableAttributes);
        if (!pred) throw new MeiliError(400, 'invalid_document_filter', 'A filter is required.');
        const keys = [...idx.docs.entries()].filter(([, d]) => pred(d)).map(([k]) => k);
        return { originalFilter: req.body.filter, deletedDocuments: idx.remove(keys) };
      });
    }),
  );

  // Search.
  const search = (uid: string, params: Record<string, any>) => {
    const started = performance.now();
    const idx = getIndex(uid);
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
          const x = getPath(a, attr) as any;
          const y = getPath(b, attr) as any;
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
  };
  app.post(
    '/indexes/:uid/search',
    wrap((req, res) => {
      res.json(search(String(req.params.uid), req.body ?? {}));
    }),
  );
  app.get(
    '/indexes/:uid/search',
    wrap((req, res) => {
      const p: Record<string, unknown> = { ...req.query };
      if (typeof p.facets === 'string') p.facets = p.facets.split(',');
      if (typeof p.sort === 'string') p.sort = p.sort.split(',');
      res.json(search(String(req.params.uid), p));
    }),
  );

  app.use((req: Request, res: Response) => {
    res.status(404).json({ message: `The fake search index does not serve ${req.method} ${req.path}.`, code: 'not_found', type: 'invalid_request', link: link('not_found') });
  });
  app.use((err: unknown, _req: Request, res: Response, _next: () => void) => {
    sendError(res, (err as { type?: string })?.type === 'entity.parse.failed' ? new MeiliError(400, 'malformed_payload', 'The payload is not valid JSON.') : err);
  });
  return app;
}

export async function startSearchIndex(port: number, host = '127.0.0.1'): Promise<Server> {
  const app = createSearchIndexServer();
  return new Promise((resolve) => {
    const server = app.listen(port, host, () => resolve(server));
  });
}
