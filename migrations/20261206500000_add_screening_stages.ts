import type { Knex } from 'knex';

const CARRIED = 'Carried over: decided before screening had two stages.';

// Two screening stages (PRISMA 2020 items 8 and 16). A decision made before has its stage set to full text (it
// was the decision that let a reference be coded), and each reference it screened gets a carried-over
// title/abstract inclusion at the time of its first decision, so every count stays as it was. A title/abstract
// exclusion may go without a reason; `awaiting_full_text` is a reference included on title and abstract.
export async function up(knex: Knex): Promise<void> {
  // knex runs each migration in its own transaction
  await knex.schema.alterTable('screening_decisions', (t) => {
    t.text('stage');
    t.boolean('carried_over').notNullable().defaultTo(false);
  });
  await knex.raw(`UPDATE screening_decisions SET stage = 'full_text'`);
  await knex.raw(
    `INSERT INTO screening_decisions (ref_id, decision, reason, note, decided_by, decided_at, stage, carried_over)
     SELECT DISTINCT ON (ref_id) ref_id, 'included', NULL, ?, decided_by, decided_at - interval '1 millisecond', 'title_abstract', true
       FROM screening_decisions WHERE undone_at IS NULL ORDER BY ref_id, decided_at, id`,
    [CARRIED],
  );
  await knex.raw(`ALTER TABLE screening_decisions ALTER COLUMN stage SET NOT NULL`);
  await knex.raw(`ALTER TABLE screening_decisions ADD CONSTRAINT screening_decisions_stage_check CHECK (stage IN ('title_abstract','full_text'))`);
  await knex.raw('ALTER TABLE screening_decisions DROP CONSTRAINT screening_decisions_reason_check');
  await knex.raw(
    `ALTER TABLE screening_decisions ADD CONSTRAINT screening_decisions_reason_check CHECK ((decision = 'included' AND reason IS NULL) OR (decision = 'excluded' AND (reason IS NOT NULL OR stage = 'title_abstract')))`,
  );
  await knex.raw('ALTER TABLE refs DROP CONSTRAINT refs_screening_status_check');
  await knex.raw(`ALTER TABLE refs ADD CONSTRAINT refs_screening_status_check CHECK (screening_status IN ('unscreened','awaiting_full_text','included','excluded'))`);
  await knex.raw('CREATE INDEX screening_decisions_ref_stage ON screening_decisions (ref_id, stage)');
}

// Back to one stage: a reference awaiting its full text is unscreened again (its title/abstract inclusion is
// marked undone, not deleted); carried-over rows go; reasons the one stage did not know become "other" with the
// reason kept in the note.
export async function down(knex: Knex): Promise<void> {
  // knex runs each migration in its own transaction
  await knex.raw(
    `UPDATE screening_decisions d SET undone_at = now()
       FROM refs r WHERE r.id = d.ref_id AND r.screening_status = 'awaiting_full_text' AND d.stage = 'title_abstract' AND d.undone_at IS NULL`,
  );
  await knex.raw(`UPDATE refs SET screening_status = 'unscreened' WHERE screening_status = 'awaiting_full_text'`);
  await knex.raw('DELETE FROM screening_decisions WHERE carried_over');
  await knex.raw(`UPDATE screening_decisions SET reason = 'other', note = coalesce(note, 'excluded on title and abstract') WHERE decision = 'excluded' AND reason IS NULL`);
  await knex.raw(`UPDATE screening_decisions SET reason = 'other', note = 'Full text not available' || coalesce(': ' || note, '') WHERE reason = 'full_text_unavailable'`);
  await knex.raw('DROP INDEX IF EXISTS screening_decisions_ref_stage');
  await knex.raw('ALTER TABLE refs DROP CONSTRAINT refs_screening_status_check');
  await knex.raw(`ALTER TABLE refs ADD CONSTRAINT refs_screening_status_check CHECK (screening_status IN ('unscreened','included','excluded'))`);
  await knex.raw('ALTER TABLE screening_decisions DROP CONSTRAINT screening_decisions_reason_check');
  await knex.raw(
    `ALTER TABLE screening_decisions ADD CONSTRAINT screening_decisions_reason_check CHECK ((decision = 'included' AND reason IS NULL) OR (decision = 'excluded' AND reason IS NOT NULL))`,
  );
  await knex.raw('ALTER TABLE screening_decisions DROP CONSTRAINT screening_decisions_stage_check');
  await knex.schema.alterTable('screening_decisions', (t) => {
    t.dropColumn('carried_over');
    t.dropColumn('stage');
  });
}
