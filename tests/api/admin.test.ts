import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';

describe('admin: users and roles', () => {
  let t: TestApp;
  let admin: Agent;
  let ids: Map<string, number>;
  beforeAll(async () => {
    t = await createTestApp();
    ids = await resetDb(t.ctx.db);
    admin = await signIn(t.app, 'admin');
  });
  afterAll(() => t.close());

  it('lists users paged and sorted on the server', async () => {
    const page1 = await admin.get('/api/admin/users?pageSize=2&sort=login&order=desc');
    expect(page1.status).toBe(200);
    expect(page1.body.total).toBe(6);
    expect(page1.body.items.map((u: { login: string }) => u.login)).toEqual(['reviewer', 'reader']);
    const page2 = await admin.get('/api/admin/users?pageSize=2&page=2&sort=login&order=desc');
    expect(page2.body.items.map((u: { login: string }) => u.login)).toEqual(['curator', 'coder2']);
    const filtered = await admin.get('/api/admin/users?q=coder');
    expect(filtered.body.total).toBe(2);
  });

  it('grants and removes a role, each change in the audit log', async () => {
    const readerId = ids.get('reader')!;
    const granted = await admin.put(`/api/admin/users/${readerId}/roles/reviewer`);
    expect(granted.status).toBe(200);
    expect(granted.body.user.roles).toEqual(['reader', 'reviewer']);
    const asReader = await signIn(t.app, 'reader');
    expect((await asReader.get('/api/me')).body.user.roles).toContain('reviewer');
    const removed = await admin.delete(`/api/admin/users/${readerId}/roles/reviewer`);
    expect(removed.body.user.roles).toEqual(['reader']);
    const audit = await admin.get(`/api/admin/audit?entityType=user&entityId=${readerId}`);
    expect(audit.body.items.map((a: { action: string }) => a.action)).toEqual(['role.revoked', 'role.granted']);
    expect(audit.body.items[0].actorLogin).toBe('admin');
    expect(audit.body.items[0].details.role).toBe('reviewer');
  });

  it('refuses an admin removing their own admin role, and unknown users', async () => {
    const self = await admin.delete(`/api/admin/users/${ids.get('admin')}/roles/admin`);
    expect(self.status).toBe(409);
    const ghost = await admin.put('/api/admin/users/999999/roles/curator');
    expect(ghost.status).toBe(404);
    expect(ghost.body.error.message).toMatch(/999999/);
    const badRole = await admin.put(`/api/admin/users/${ids.get('reader')}/roles/overlord`);
    expect(badRole.status).toBe(400);
    expect(badRole.body.error.details[0].path).toBe('path.role');
  });

  it('keeps the audit log append-only in the database itself', async () => {
    await expect(t.ctx.db('audit_log').update({ action: 'tampered' })).rejects.toThrow(/append-only/);
    await expect(t.ctx.db('audit_log').delete()).rejects.toThrow(/append-only/);
  });

  it('an admin holds every role: curator, reviewer and contributor routes let them in, /api/me says so, and they count as a curator and a coder', async () => {
    const me = (await admin.get('/api/me')).body as { user: { roles: string[]; effectiveRoles: string[] } };
    expect(me.user.roles).toEqual(expect.arrayContaining(['admin']));
    expect(me.user.roles).not.toContain('curator');
    expect(me.user.effectiveRoles).toEqual(['reader', 'contributor', 'curator', 'reviewer', 'admin']);
    for (const path of ['/api/assignments/candidates', '/api/extractions/claimable']) expect((await admin.get(path)).status, path).toBe(200);
    expect((await admin.post('/api/syntheses').send({})).status).not.toBe(403);
    const coders = await admin.get('/api/assignments/coders');
    expect(coders.status).toBe(200);
    const listed = JSON.stringify(coders.body);
    expect(listed).toContain('"admin"');
    // a reader is still refused
    const reader = await signIn(t.app, 'reader');
    expect((await reader.get('/api/assignments/candidates')).status).toBe(403);
  });
});
