import type { Knex } from 'knex';

// One mail that failed for good during an invented mail-server outage, so the admin mail screen has something to resend.
export const DEMO_FAILED_MAIL_SUBJECT = 'Chronometa: a reference is waiting for your coding (sent again after an outage)';

export async function seed(knex: Knex): Promise<void> {
  if (await knex('mail_log').where({ subject: DEMO_FAILED_MAIL_SUBJECT }).first('id')) return;
  await knex('mail_log').insert({
    kind: 'assignment',
    to_address: 'tomasz.brandvold@pacemaker-unit.example',
    subject: DEMO_FAILED_MAIL_SUBJECT,
    body: 'A reference in the demo registry is assigned to you for double coding. Open "My extractions" to start.',
    status: 'failed',
    attempts: 12,
    last_error: 'connect ECONNREFUSED 127.0.0.1:587 (the mail server was unreachable)',
  });
}
