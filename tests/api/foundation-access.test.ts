import { describeAccess } from '../support/access.js';

describeAccess(
  'foundation routes',
  [
    { method: 'get', path: '/api/health', who: 'anyone' },
    { method: 'get', path: '/api/me', who: 'signed-in' },
    { method: 'get', path: '/api/admin/users', who: ['admin'], bad: { path: '/api/admin/users?page=0&sort=password' } },
    { method: 'put', path: (ids) => `/api/admin/users/${ids.reader}/roles/reviewer`, who: ['admin'], bad: { path: '/api/admin/users/abc/roles/wizard' } },
    { method: 'delete', path: (ids) => `/api/admin/users/${ids.reader}/roles/reviewer`, who: ['admin'], bad: { path: '/api/admin/users/-1/roles/reviewer' } },
    { method: 'get', path: '/api/admin/audit', who: ['admin'], bad: { path: '/api/admin/audit?pageSize=100000' } },
    { method: 'get', path: '/api/tokens', who: 'signed-in' },
    { method: 'post', path: '/api/tokens', body: { name: 'script' }, who: 'signed-in', bad: { body: { name: '' } } },
    { method: 'delete', path: '/api/tokens/999999', who: 'signed-in', bad: { path: '/api/tokens/not-a-number' } },
  ],
  async (t) => {
    const reader = await t.ctx.db('users').where({ login: 'reader' }).first('id');
    return { reader: reader.id };
  },
);
