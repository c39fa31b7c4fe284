import type { Knex } from 'knex';
import { readRegistryVersion } from '../repositories/registry-version.js';

/**
 * Values keyed by registry version: every settled change bumps the version and so retires the whole cache.
 * The key is the version's stamp (its id and time). At most `maxEntries` values, and at most `maxSize` in
 * all as `sizeOf` measures them; past either the cache starts again.
 */
export class RegistryMemo<T> {
  private key = '';
  private entries = new Map<string, Promise<T>>();
  private size = 0;
  constructor(
    private readonly maxEntries: number,
    private readonly maxSize = Infinity,
    private readonly sizeOf: (value: T) => number = () => 0,
  ) {}

  private inflight: Promise<string> | null = null;

  /**
   * Requests that arrive while a lookup is running share it (single flight): under load one query serves
   * many requests, and a lone request still reads the version itself.
   */
  versionKey(db: Knex): Promise<string> {
    this.inflight ??= readRegistryVersion(db)
      .then((v) => v.stamp)
      .finally(() => {
        this.inflight = null;
      });
    return this.inflight;
  }

  /** Whether a value for `name` is kept (or being computed) for the current registry version. */
  async has(db: Knex, name: string): Promise<boolean> {
    const key = await this.versionKey(db);
    return key === this.key && this.entries.has(name);
  }

  /** Whether a value for `name` is kept for the registry version last read, without reading it again (an estimate). */
  peek(name: string): boolean {
    return this.entries.has(name);
  }

  async get(db: Knex, name: string, compute: () => Promise<T>): Promise<T> {
    const key = await this.versionKey(db);
    if (key !== this.key) {
      this.key = key;
      this.entries = new Map();
      this.size = 0;
    }
    let hit = this.entries.get(name);
    if (!hit) {
      if (this.entries.size >= this.maxEntries || this.size >= this.maxSize) {
        this.entries = new Map();
        this.size = 0;
      }
      const entries = this.entries;
      hit = compute().then((v) => {
        if (entries === this.entries) this.size += this.sizeOf(v);
        return v;
      });
      hit.catch(() => entries.delete(name));
      entries.set(name, hit);
    }
    return hit;
  }
}

/** Serialized answers keyed by registry version (answers are UTF-16 strings: about 2 bytes a character). */
export class RegistryCache extends RegistryMemo<string> {
  constructor(maxEntries = 500, maxChars = 32 * 1024 * 1024) {
    super(maxEntries, maxChars, (text) => text.length);
  }

  override get(db: Knex, name: string, compute: () => Promise<unknown>): Promise<string> {
    return super.get(db, name, () => compute().then((v) => JSON.stringify(v)));
  }
}
