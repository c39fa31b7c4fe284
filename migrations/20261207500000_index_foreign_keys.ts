import type { Knex } from 'knex';

// Indexes on the foreign keys that had none, apart from those to users (never deleted): without them every
// delete or merge of a reference, record or snapshot scanned the referencing table once per row (deleting
// 95,000 references took minutes), and looking up a reference's duplicate candidates or a record's settlement
// read the whole table. Partial (non-null values only): most of these columns are empty, a foreign-key check
// looks up one value, and an insert of an empty one writes no index entry.
const INDEXES: Array<[table: string, column: string]> = [
  ['refs', 'merged_into'],
  ['import_entries', 'likely_duplicate_of'],
  ['ref_duplicate_candidates', 'ref_b'],
  ['screening_votes', 'settled_by_decision'],
  ['settlements', 'assignment_id'],
  ['settlements', 'record_id'],
  ['extractions', 'superseded_by'],
  ['extractions', 'supersedes_id'],
  ['follows', 'snapshot_id'],
];

const nameOf = (table: string, column: string) => `${table}_${column}_fk_index`;

export async function up(knex: Knex): Promise<void> {
  for (const [table, column] of INDEXES) await knex.raw('CREATE INDEX ?? ON ?? (??) WHERE ?? IS NOT NULL', [nameOf(table, column), table, column, column]);
}

export async function down(knex: Knex): Promise<void> {
  for (const [table, column] of INDEXES) await knex.raw('DROP INDEX ??', [nameOf(table, column)]);
}
