import { describeAccess } from '../support/access.js';

const body = { request: { filters: { manipulation: 'luminance' }, method: 'DL', hksj: false } };

// Following, listing one's follows and stopping one ask only for a sign-in (another user's follow is a 404, in
// tests/api/follows-mine.test.ts); the feed and the unsubscribe link are read signed out (the token is the authority).
describeAccess('follows', [
  { method: 'post', path: '/api/follows', body, who: 'signed-in', bad: { body: { ...body, weightShare: 1.5 } } },
  { method: 'get', path: '/api/follows', who: 'signed-in' },
  { method: 'delete', path: '/api/follows/999999', who: 'signed-in', bad: { path: '/api/follows/abc' } },
  { method: 'get', path: '/api/follows/999999/feed.atom', who: 'anyone', bad: { path: '/api/follows/abc/feed.atom' } },
  { method: 'get', path: `/api/follows/unsubscribe?token=${'0'.repeat(48)}`, who: 'anyone', bad: { path: '/api/follows/unsubscribe?token=nope' } },
]);
