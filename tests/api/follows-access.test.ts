import { describeAccess, type SetupIds } from '../support/access.js';
import { createSnapshot } from '../../server/services/snapshots.js';
import { synthesisRequestSchema } from '../../shared/schemas/synthesis.js';
import { settleInventedReference } from './syntheses-fixtures.js';

const body = { request: { filters: { manipulation: 'luminance' }, method: 'DL', hksj: false } };

// Following (a synthesis or a snapshot), listing one's follows, their changes and stopping one ask only for a sign-in
// (another user's follow is a 404, in tests/api/follows-mine.test.ts and follows-snapshot.test.ts); the feeds, a
// snapshot's diff and the unsubscribe link are read signed out (the token is the authority).
describeAccess(
  'follows',
  [
    { method: 'post', path: '/api/follows', body, who: 'signed-in', bad: { body: { ...body, weightShare: 1.5 } } },
    { method: 'post', path: '/api/follows', body: (ids: SetupIds) => ({ snapshotId: ids.snapshot }), who: 'signed-in', bad: { body: { ...body, snapshotId: '0000000000000000' } } },
    { method: 'get', path: '/api/follows', who: 'signed-in' },
    { method: 'get', path: '/api/follows/999999/changes', who: 'signed-in', bad: { path: '/api/follows/abc/changes?since=0' } },
    { method: 'delete', path: '/api/follows/999999', who: 'signed-in', bad: { path: '/api/follows/abc' } },
    { method: 'get', path: '/api/follows/999999/feed.atom', who: 'anyone', bad: { path: '/api/follows/abc/feed.atom' } },
    { method: 'get', path: `/api/follows/unsubscribe?token=${'0'.repeat(48)}`, who: 'anyone', bad: { path: '/api/follows/unsubscribe?token=nope' } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}/diff`, who: 'anyone', bad: { path: '/api/snapshots/NOT-AN-ID/diff' } },
    { method: 'get', path: (ids) => `/api/snapshots/${ids.snapshot}/feed.atom`, who: 'anyone', bad: { path: '/api/snapshots/0000000000000000/feed.atom' } },
  ],
  async (t) => {
    for (let i = 0; i < 3; i++) await settleInventedReference(t.ctx.db, 'luminance', 2010 + i, [{ mean1: 650 + i * 10, mean2: 600, sd: 90, n: 20 }]);
    const reviewer = await t.ctx.db('users').where({ login: 'reviewer' }).first('id');
    const request = synthesisRequestSchema.parse({ filters: { manipulation: 'luminance', metric: 'g_s' }, method: 'DL' });
    const snap = await createSnapshot(t.ctx.db, reviewer.id, request, undefined, process.env.APP_ORIGIN!);
    return { snapshot: snap.id };
  },
);
