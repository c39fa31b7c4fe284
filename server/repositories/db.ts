import type { Knex } from 'knex';

/** A connection or the transaction of the change: every repository function takes one. */
export type Db = Knex | Knex.Transaction;

export interface PageRequest {
  page: number;
  pageSize: number;
}

/** How many rows a query matches (its own clone, so the query can still be paged). */
export async function countRows(q: Knex.QueryBuilder, column = '*'): Promise<number> {
  const [row] = await q.clone().clearSelect().clearOrder().count<{ count: string | number }[]>({ count: column });
  return Number(row?.count ?? 0);
}

/** Limits a query to one page. */
export function pageOf<Q extends Knex.QueryBuilder>(q: Q, p: PageRequest): Q {
  return q.limit(p.pageSize).offset((p.page - 1) * p.pageSize) as Q;
}

/** "Okafor 2019": how a reference is named in lists and mails. */
export const refLabel = (r: { first_author?: string | null; year?: number | null }) => `${r.first_author ?? 'Anon.'} ${r.year ?? 'n.d.'}`;

export const iso = (d: Date | string) => new Date(d).toISOString();
export const isoOrNull = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);
