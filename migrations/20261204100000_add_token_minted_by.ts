import type { Knex } from 'knex';

// The token a token was minted with, so revoking it revokes its whole chain. Tokens created before this
// migration are untracked (null), as are those minted from a session.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('api_tokens', (t) => {
    t.integer('minted_by_token_id').references('api_tokens.id').onDelete('SET NULL');
    t.index(['minted_by_token_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('api_tokens', (t) => {
    t.dropIndex(['minted_by_token_id']);
    t.dropColumn('minted_by_token_id');
  });
}
