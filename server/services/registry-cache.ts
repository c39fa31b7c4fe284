import type { Knex } from 'knex';
import { readRegistryVersion } from '../repositories/registry-version.js';

/**
 * Serialized answers keyed by registry version: every settled change bumps the version and so retires
 * the whole cache. The key is the version's stamp (its id and time).
 */
export class RegistryCache {
  private key = '';
  private entries = new Map<string, Promise<string>>();
  private bytes = 0;
  constructor(
    private readonly maxEntries = 500,
    /** answers are UTF-16 strings: about 2 bytes a character */
    private readonly maxChars = 32 * 1024 * 1024,
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

  /** Whether an answer for `name` is kept (or being computed) for the current registry version. */
  async has(db: Knex, name: string): Promise<boolean> {
    const key = await this.versionKey(db);
    return key === this.key && this.entries.has(name);
  }

  async get(db: Knex, name: string, compute: () => Promise<unknown>): Promise<string> {
    const key = await this.versionKey(db);
    if (key !== this.key) {
      this.key = key;
      this.entries = new Map();
      this.bytes = 0;
    }
    let hit = this.entries.get(name);
    if (!hit) {
      if (this.entries.size >= this.maxEntries || this.bytes >= this.maxChars) {
        this.entries = new Map();
        this.bytes = 0;
      }
      const entries = this.entries;
      hit = compute().then((v) => {
        const text = JSON.stringify(v);
        if (entries === this.entries) this.bytes += text.length;
        return text;
      });
      hit.catch(() => entries.delete(name));
      entries.set(name, hit);
    }
    return hit;
  }
}
