import { Meilisearch, type Index } from 'meilisearch';

export const REFERENCES_INDEX = 'references';

/** The settings of every index the app keeps (another feature registers its own with `defineIndex`). */
const INDEX_SETTINGS: Record<string, { primaryKey: string; settings: Record<string, unknown> }> = {
  [REFERENCES_INDEX]: {
    primaryKey: 'id',
    settings: {
      searchableAttributes: ['title', 'authors', 'container', 'doi', 'abstract'],
      filterableAttributes: ['year', 'screening_status', 'source', 'id', 'manipulations', 'outcomes', 'tasks'],
      sortableAttributes: ['year', 'created_at', 'title_sort'],
    },
  },
};

export function defineIndex(uid: string, primaryKey: string, settings: Record<string, unknown>): void {
  INDEX_SETTINGS[uid] = { primaryKey, settings };
}

export class SearchUnavailableError extends Error {}

/** Where each index's build marker lives: an index of its own, so searches never see it. */
export const META_INDEX = 'chronometa_meta';
const isRequestError = (err: unknown) => ['MeilisearchRequestError', 'MeilisearchRequestTimeOutError'].includes((err as Error).name);

/**
 * The app's one door to the search index (Meilisearch through its JavaScript client; a local fake in
 * development and tests). Writes wait for their task, so a caller that awaits them reads its own write.
 */
export class SearchIndex {
  readonly client: Meilisearch;
  private readonly ready = new Map<string, Promise<void>>();

  constructor(host: string, apiKey?: string, readonly taskTimeoutMs = 30_000) {
    this.client = new Meilisearch({ host, apiKey, timeout: 10_000 });
  }

  index(uid: string): Index {
    return this.client.index(uid);
  }

  /** Creates the index and applies its settings once per process (again after the server forgot them). */
  ensure(uid: string): Promise<void> {
    let p = this.ready.get(uid);
    if (!p) {
      const def = INDEX_SETTINGS[uid];
      p = (async () => {
        if (!def) return;
        await this.client.index(uid).updateSettings(def.settings).waitTask({ timeout: this.taskTimeoutMs });
      })();
      p.catch(() => this.ready.delete(uid));
      this.ready.set(uid, p);
    }
    return p;
  }

  private async withIndex<T>(uid: string, fn: (idx: Index) => Promise<T>): Promise<T> {
    await this.ensure(uid);
    try {
      return await fn(this.client.index(uid));
    } catch (err) {
      // A search server that restarted has lost the index or its settings: set them up again, once.
      const code = (err as { cause?: { code?: string } }).cause?.code ?? '';
      if (code === 'index_not_found' || (/^invalid_search_(filter|facets|sort)$/.test(code) && /not (filterable|sortable)/.test(String((err as Error).message)))) {
        this.ready.delete(uid);
        await this.ensure(uid);
        return fn(this.client.index(uid));
      }
      throw err;
    }
  }

  async indexDocuments(uid: string, docs: Record<string, unknown>[]): Promise<void> {
    if (!docs.length) return;
    const pk = INDEX_SETTINGS[uid]?.primaryKey;
    await this.withIndex(uid, async (idx) => {
      for (let i = 0; i < docs.length; i += 5000) {
        const task = await idx.addDocuments(docs.slice(i, i + 5000), pk ? { primaryKey: pk } : undefined).waitTask({ timeout: this.taskTimeoutMs });
        if (task.status === 'failed') throw new Error(`indexing failed: ${task.error?.message}`);
      }
    });
  }

  async deleteDocuments(uid: string, ids: Array<string | number>): Promise<void> {
    if (!ids.length) return;
    await this.withIndex(uid, (idx) => idx.deleteDocuments(ids.map(String)).waitTask({ timeout: this.taskTimeoutMs }));
  }

  async deleteAll(uid: string): Promise<void> {
    await this.withIndex(uid, (idx) => idx.deleteAllDocuments().waitTask({ timeout: this.taskTimeoutMs }));
  }

  async count(uid: string): Promise<number> {
    try {
      return (await this.client.index(uid).getStats()).numberOfDocuments;
    } catch {
      return 0;
    }
  }

  /** The build id the index holds (written after its last rebuild); null when the server does not know it. */
  async readBuild(uid: string): Promise<string | null> {
    try {
      const doc = await this.client.index(META_INDEX).getDocument<{ id: string; build: string }>(uid);
      return typeof doc.build === 'string' ? doc.build : null;
    } catch (err) {
      if (isRequestError(err)) throw new SearchUnavailableError(`The search index cannot be reached (${(err as Error).message}).`);
      const code = (err as { cause?: { code?: string } }).cause?.code ?? '';
      if (code === 'index_not_found' || code === 'document_not_found') return null;
      throw err;
    }
  }

  async writeBuild(uid: string, build: string): Promise<void> {
    const task = await this.client.index(META_INDEX).addDocuments([{ id: uid, build }], { primaryKey: 'id' }).waitTask({ timeout: this.taskTimeoutMs });
    if (task.status === 'failed') throw new Error(`writing the build marker failed: ${task.error?.message}`);
  }

  async search<T extends Record<string, unknown>>(uid: string, q: string, params: Record<string, unknown>) {
    try {
      return await this.withIndex(uid, (idx) => idx.search<T>(q, params as never));
    } catch (err) {
      if (isRequestError(err)) {
        throw new SearchUnavailableError(`The search index cannot be reached (${(err as Error).message}).`);
      }
      throw err;
    }
  }
}

export function createSearchIndex(host: string | undefined, apiKey: string | undefined): SearchIndex | null {
  return host ? new SearchIndex(host, apiKey) : null;
}
