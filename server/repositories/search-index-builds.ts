import type { Db } from './db.js';

export interface IndexBuild {
  build: string | null;
  documentSchema: number;
}

/** The build of an index the database expects (null build: being rebuilt, or known to have missed a change). */
export async function readIndexBuild(db: Db, uid: string): Promise<IndexBuild | null> {
  const row: { build: string | null; document_schema: number } | undefined = await db('search_index_builds').where({ index_uid: uid }).first('build', 'document_schema');
  return row ? { build: row.build, documentSchema: row.document_schema } : null;
}

export async function storeIndexBuild(db: Db, uid: string, b: { build: string; documentSchema: number; documents: number }): Promise<void> {
  await db('search_index_builds')
    .insert({ index_uid: uid, build: b.build, document_schema: b.documentSchema, documents: b.documents, built_at: db.fn.now() })
    .onConflict('index_uid')
    .merge();
}

export async function markIndexStale(db: Db, uid: string): Promise<void> {
  await db('search_index_builds').where({ index_uid: uid }).update({ build: null });
}
