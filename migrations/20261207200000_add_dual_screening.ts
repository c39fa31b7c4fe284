import type { Knex } from 'knex';

// Dual independent screening (PRISMA 2020 item 8). `screening_rule` is the project's one rule (how many screeners
// decide each record, one row). `screening_votes` holds each screener's blind decision at a stage; a vote is
// settled by the decision (screening_decisions) it led to, and withdrawn when taken back or superseded.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('screening_rule', (t) => {
    t.integer('id').primary().defaultTo(1);
    t.integer('screeners').notNullable().defaultTo(1);
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw('ALTER TABLE screening_rule ADD CONSTRAINT screening_rule_one_row CHECK (id = 1)');
  await knex.raw('ALTER TABLE screening_rule ADD CONSTRAINT screening_rule_screeners_check CHECK (screeners IN (1, 2))');
  await knex('screening_rule').insert({ id: 1, screeners: 1 });
  await knex.schema.createTable('screening_votes', (t) => {
    t.increments('id');
    t.integer('ref_id').notNullable().references('refs.id').onDelete('CASCADE');
    t.text('stage').notNullable();
    t.text('decision').notNullable();
    t.text('reason');
    t.text('note');
    t.integer('decided_by').notNullable().references('users.id');
    t.timestamp('decided_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.integer('settled_by_decision').references('screening_decisions.id').onDelete('SET NULL');
    t.timestamp('withdrawn_at', { useTz: true });
  });
  await knex.raw(`ALTER TABLE screening_votes ADD CONSTRAINT screening_votes_stage_check CHECK (stage IN ('title_abstract','full_text'))`);
  await knex.raw(`ALTER TABLE screening_votes ADD CONSTRAINT screening_votes_decision_check CHECK (decision IN ('included','excluded'))`);
  // One live vote per screener, record and stage: the same person cannot be both screeners.
  await knex.raw('CREATE UNIQUE INDEX screening_votes_one_per_screener ON screening_votes (ref_id, stage, decided_by) WHERE withdrawn_at IS NULL');
  await knex.raw('CREATE INDEX screening_votes_ref_stage ON screening_votes (ref_id, stage) WHERE withdrawn_at IS NULL');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('screening_votes');
  await knex.schema.dropTable('screening_rule');
}
