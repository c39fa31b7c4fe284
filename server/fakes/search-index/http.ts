import express, { type Request, type Response } from 'express';
import type { Server } from 'node:http';
import { buildFilter } from './filter.js';
import { FakeIndex, searchIndex } from './memory-index.js';
import { MeiliError, errorLink as link } from './errors.js';
import type { Doc } from './documents.js';

/**
 * A loopback stand-in for a Meilisearch server: the part of its HTTP API the `meilisearch` 0.62 client
 * uses (health, indexes, settings, documents add/replace/update/delete, search with q, filter, facets,
 * sort, limit and offset, tasks), kept in memory and searched with minisearch. Tasks finish before the
 * request that enqueued them answers, so `waitTask()` returns on its first poll.
 */

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


export function createSearchIndexServer() {
  const indexes = new Map<string, FakeIndex>();
  const tasks = new Map<number, Task>();
  let nextTask = 0;
  const app = express();
  app.use(express.json({ limit: '200mb', type: () => true }));

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

  app.post(
    '/indexes/:uid/search',
    wrap((req, res) => {
      res.json(searchIndex(getIndex(String(req.params.uid)), req.body ?? {}));
    }),
  );
  app.get(
    '/indexes/:uid/search',
    wrap((req, res) => {
      const p: Record<string, unknown> = { ...req.query };
      if (typeof p.facets === 'string') p.facets = p.facets.split(',');
      if (typeof p.sort === 'string') p.sort = p.sort.split(',');
      res.json(searchIndex(getIndex(String(req.params.uid)), p));
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
