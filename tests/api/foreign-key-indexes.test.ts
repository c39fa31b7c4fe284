import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../support/test-app.js';
import * as migration from '../../migrations/20261207500000_index_foreign_keys.js';

// Every foreign key of ours (the public schema; pg-boss keeps its own), but those to users, who are never
// deleted, leads an index, so deleting or merging the row it points to never scans the referencing table once per row.
describe('foreign keys have indexes', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(async () => {
    await t.close();
  });

  const unindexed = async () =>
    (
      await t.ctx.db.raw(`
      select c.conrelid::regclass::text as "table", a.attname as "column", c.confrelid::regclass::text as "target"
      from pg_constraint c
      join pg_attribute a on a.attrelid = c.conrelid and a.attnum = c.conkey[1]
      where c.contype = 'f' and c.connamespace = 'public'::regnamespace and c.confrelid <> 'users'::regclass
        and not exists (select 1 from pg_index i where i.indrelid = c.conrelid and i.indkey[0] = a.attnum)
      order by 1, 2`)
    ).rows as Array<{ table: string; column: string; target: string }>;

  it('finds no foreign key column without an index that starts with it', async () => {
    expect(await unindexed()).toEqual([]);
  });

  it("the migration's down() drops its indexes and up() builds them again", async () => {
    await migration.down(t.ctx.db);
    expect((await unindexed()).map((r) => `${r.table}.${r.column}`)).toContain('refs.merged_into');
    await migration.up(t.ctx.db);
    expect(await unindexed()).toEqual([]);
  });
});
