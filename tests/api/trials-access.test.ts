import { describeAccess } from '../support/access.js';
import { insertReference } from './extraction-fixtures.js';

// Row-level refusals (the other coder, a curator uploading to a coder's sheet) are in trials.test.ts.
describeAccess(
  'trial data routes',
  [
    { method: 'post', path: '/api/extractions/999999/trial-sets', body: { label: 'x' }, who: ['contributor'], bad: { path: '/api/extractions/abc/trial-sets' } },
    { method: 'get', path: (ids) => `/api/extractions/${ids.extraction}/trial-sets`, who: ['contributor'], bad: { path: '/api/extractions/0/trial-sets' } },
    { method: 'get', path: (ids) => `/api/trial-sets/${ids.set}`, who: ['contributor'], bad: { path: '/api/trial-sets/x' } },
    { method: 'post', path: '/api/trial-sets/999999/fits', body: {}, who: ['contributor'], bad: { path: '/api/trial-sets/999999/fits', body: { resamples: 5 } } },
    {
      method: 'get', path: (ids) => `/api/trial-sets/${ids.set}/contrast?parameter=pse&conditionA=a&conditionB=b`, who: ['contributor'],
      bad: { path: (ids) => `/api/trial-sets/${ids.set}/contrast?parameter=slope&conditionA=a&conditionB=a` },
    },
    { method: 'get', path: (ids) => `/api/trial-sets/${ids.set}/trials.csv`, who: ['contributor'], bad: { path: '/api/trial-sets/-1/trials.csv' } },
    { method: 'get', path: '/api/snapshots/zzzzzzzzzzzz/trials.csv', who: 'anyone', bad: { path: '/api/snapshots/ABC/trials.csv' } },
  ],
  async (t) => {
    const ref = await insertReference(t.ctx.db);
    const coder = await t.ctx.db('users').where({ login: 'coder1' }).first('id');
    const [x] = await t.ctx.db('extractions').insert({ reference_id: ref, kind: 'coding', coder_id: coder.id, state: 'draft' }).returning('id');
    const [set] = await t.ctx
      .db('trial_sets')
      .insert({
        extraction_id: x.id, label: 'order', task: 'order', modality: 'audiovisual', format: 'counts', row_count: 4, trial_count: 40, participant_count: 1,
        conditions: JSON.stringify(['a', 'b']), level_min: 0, level_max: 100, uploaded_by: coder.id,
      })
      .returning('id');
    return { extraction: x.id, set: set.id };
  },
);
