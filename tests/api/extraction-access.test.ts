import { describeAccess } from '../support/access.js';
import { createSettledRecord } from '../../server/services/settlement.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

describeAccess(
  'extraction, reconciliation, effects, manipulations, agreement and mail routes',
  [
    { method: 'get', path: '/api/effects', who: 'anyone', bad: { path: '/api/effects?pageSize=100000' } },
    { method: 'get', path: (ids) => `/api/effects/${ids.effect}`, who: 'anyone', bad: { path: '/api/effects/abc' } },
    { method: 'patch', path: (ids) => `/api/effects/${ids.effect}`, body: { version: 99, reason: 'check', effect: {} }, who: ['curator'], bad: { body: { version: 0 } } },
    { method: 'post', path: '/api/effects/999999/withdraw', body: { reason: 'duplicate data' }, who: ['curator'], bad: { body: { reason: '' } } },
    { method: 'get', path: '/api/manipulations', who: 'anyone', bad: { path: '/api/manipulations?sort=colour' } },
    { method: 'post', path: '/api/manipulations', body: { term: 'colour_saturation', label: 'Colour saturation' }, who: ['curator'], bad: { body: { term: 'Not A Slug', label: '' } } },
    { method: 'patch', path: '/api/manipulations/luminance', body: { version: 999, label: 'Luminance' }, who: ['curator'], bad: { path: '/api/manipulations/BAD%20TERM', body: { version: 1 } } },
    { method: 'get', path: '/api/extractions', who: ['contributor'], bad: { path: '/api/extractions?state=lost' } },
    { method: 'get', path: '/api/extractions/claimable', who: ['contributor'], bad: { path: '/api/extractions/claimable?sort=colour' } },
    { method: 'post', path: '/api/extractions', body: { referenceId: 999999 }, who: ['contributor'], bad: { body: { referenceId: 'abc' } } },
    { method: 'get', path: (ids) => `/api/extractions/${ids.extraction}`, who: ['contributor'], bad: { path: '/api/extractions/0' } },
    { method: 'put', path: '/api/extractions/999999', body: { version: 99, sheet: { studies: [] } }, who: ['contributor'], bad: { body: { version: 'x' } } },
    { method: 'post', path: '/api/extractions/999999/submit', body: { version: 99 }, who: ['contributor'], bad: { body: {} } },
    { method: 'get', path: '/api/assignments', who: ['curator'], bad: { path: '/api/assignments?state=lost' } },
    { method: 'get', path: '/api/assignments/candidates', who: ['curator'], bad: { path: '/api/assignments/candidates?sort=colour' } },
    { method: 'get', path: '/api/assignments/coders', who: ['curator'] },
    { method: 'post', path: '/api/assignments', body: { referenceId: 999999, coder1Id: 1, coder2Id: 2 }, who: ['curator'], bad: { body: { referenceId: 1, coder1Id: 3, coder2Id: 3 } } },
    { method: 'get', path: '/api/reconciliation', who: ['curator'], bad: { path: '/api/reconciliation?pageSize=0' } },
    { method: 'get', path: '/api/reconciliation/999999', who: ['curator'], bad: { path: '/api/reconciliation/x' } },
    { method: 'put', path: '/api/reconciliation/999999/discrepancies/1', body: { resolution: 'a', rationale: 'matches table' }, who: ['curator'], bad: { body: { resolution: 'c' } } },
    { method: 'post', path: '/api/reconciliation/999999/settle', body: {}, who: ['curator'], bad: { path: '/api/reconciliation/-5/settle' } },
    {
      method: 'post', path: '/api/reconciliation/999999/reconcile', body: { version: 1, rationale: 'matches table', decisions: [{ discrepancyId: 1, resolution: 'a' }] }, who: ['curator'],
      bad: { body: { version: 1, rationale: '', decisions: [{ discrepancyId: 1, resolution: 'c' }] } },
    },
    { method: 'get', path: (ids) => `/api/records?referenceId=${ids.ref}`, who: 'anyone', bad: { path: '/api/records?referenceId=abc' } },
    { method: 'get', path: (ids) => `/api/records/${ids.record}`, who: 'anyone', bad: { path: '/api/records/0' } },
    { method: 'post', path: '/api/records/999999/reopen', body: { reason: 'misread table' }, who: ['curator'], bad: { body: { reason: '' } } },
    { method: 'post', path: '/api/records/999999/settle', body: { rationale: 'ok' }, who: ['curator'], bad: { path: '/api/records/x/settle' } },
    { method: 'post', path: '/api/records/999999/withdraw', body: { reason: 'duplicate data' }, who: ['curator'], bad: { body: {} } },
    { method: 'get', path: '/api/agreement', who: ['curator', 'reviewer'] },
    { method: 'get', path: '/api/agreement/references', who: ['curator', 'reviewer'], bad: { path: '/api/agreement/references?sort=colour' } },
    { method: 'get', path: (ids) => `/api/agreement/references/${ids.ref}`, who: ['curator', 'reviewer'], bad: { path: '/api/agreement/references/x' } },
    { method: 'get', path: '/api/mail/log', who: ['admin'], bad: { path: '/api/mail/log?status=lost' } },
    { method: 'get', path: '/api/mail/mailbox', who: ['admin'], bad: { path: '/api/mail/mailbox?page=0' } },
  ],
  // Row-level refusals (another coder's sheet) are checked in extraction-flow.test.ts.
  async (t) => {
    const ref = await insertReference(t.ctx.db);
    const settled = await t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: ref, sheet: luminanceSheet() }));
    const coder = await t.ctx.db('users').where({ login: 'coder1' }).first('id');
    const other = await insertReference(t.ctx.db);
    const [x] = await t.ctx.db('extractions').insert({ reference_id: other, kind: 'coding', coder_id: coder.id, state: 'draft' }).returning('id');
    return { ref, record: settled.recordId, effect: settled.effectIds[0], extraction: x.id };
  },
);
