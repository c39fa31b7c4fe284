import { describeAccess } from '../support/access.js';

const body = { request: { filters: { manipulation: 'luminance' }, method: 'DL', hksj: false } };

// Following asks only for a sign-in; the feed and the unsubscribe link are read signed out (the token is the authority).
describeAccess('follows', [
  { method: 'post', path: '/api/follows', body, who: 'signed-in', bad: { body: { ...body, weightShare: 1.5 } } },
  { method: 'get', path: '/api/follows/999999/feed.atom', who: 'anyone', bad: { path: '/api/follows/abc/feed.atom' } },
  { method: 'get', path: `/api/follows/unsubscribe?token=${'0'.repeat(48)}`, who: 'anyone', bad: { path: '/api/follows/unsubscribe?token=nope' } },
]);
