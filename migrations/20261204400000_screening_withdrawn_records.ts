import type { Knex } from 'knex';

// A decision keeps the settled records its exclusion withdrew, so undoing it can restore exactly those; a
// restoring undo is a settlement of its own kind. Existing exclusions take theirs from their audit entry (same
// transaction, so the same timestamp).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('screening_decisions', (t) => {
    t.jsonb('withdrawn_records').notNullable().defaultTo('[]');
  });
  await knex.raw(`
    UPDATE screening_decisions d SET withdrawn_records = a.details->'withdrawnRecords'
      FROM audit_log a
     WHERE a.action = 'screening.decide' AND a.entity_type = 'reference' AND a.entity_id = d.ref_id::text
       AND a.at = d.decided_at AND jsonb_typeof(a.details->'withdrawnRecords') = 'array'`);
  await knex.raw('ALTER TABLE settlements DROP CONSTRAINT settlements_kind_check');
  await knex.raw(`ALTER TABLE settlements ADD CONSTRAINT settlements_kind_check CHECK (kind IN ('matched','reconciled','direct','reopened','withdrawn','edited','restored'))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`UPDATE settlements SET kind = 'edited', rationale = 'restored: ' || rationale WHERE kind = 'restored'`);
  await knex.raw('ALTER TABLE settlements DROP CONSTRAINT settlements_kind_check');
  await knex.raw(`ALTER TABLE settlements ADD CONSTRAINT settlements_kind_check CHECK (kind IN ('matched','reconciled','direct','reopened','withdrawn','edited'))`);
  await knex.schema.alterTable('screening_decisions', (t) => {
    t.dropColumn('withdrawn_records');
  });
}
