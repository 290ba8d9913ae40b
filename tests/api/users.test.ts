import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { AuditEntry } from '../../api/src/db/models.ts';
import { createTestApi, signIn, type TestApi } from '../helpers/api.ts';

let t: TestApi;
beforeAll(async () => {
  t = await createTestApi({ seedPlant: false });
});
afterAll(async () => t?.close());

const asAdmin = (method: 'get' | 'post' | 'patch', path: string) => request(t.app)[method](path).set('X-Ferrisight-Csrf', '1').set('Cookie', t.cookies.admin);

describe('users', () => {
  it('when an admin creates a user, then the user can sign in and the change is audited', async () => {
    const res = await asAdmin('post', '/api/users').send({ email: 'New.Person@Test.example', name: 'New Person', role: 'supervisor', password: 'twelve chars!' });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: 'new.person@test.example', role: 'supervisor', disabled: false });
    expect(res.body.user.passwordHash).toBeUndefined();
    await signIn(t.app, 'new.person@test.example', 'twelve chars!');
    expect(await AuditEntry.count({ where: { action: 'user.create', entityId: String(res.body.user.id) } })).toBe(1);
  });

  it('when the e-mail is taken, then 409', async () => {
    const res = await asAdmin('post', '/api/users').send({ email: 't-operator@test.example', name: 'Dup', role: 'operator', password: 'long enough pw' });
    expect(res.status).toBe(409);
  });

  it('when fields are bad, then 400 lists each field', async () => {
    const res = await asAdmin('post', '/api/users').send({ email: 'x', name: '', role: 'boss', password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['email', 'name', 'password', 'role']);
  });

  it('when a 64+ character passphrase is given, then it is accepted (ASVS 5.0 6.2.9)', async () => {
    const res = await asAdmin('post', '/api/users').send({ email: 'long@test.example', name: 'Long', role: 'operator', password: 'p'.repeat(100) });
    expect(res.status).toBe(201);
  });

  it('when an admin changes a role, then the change sticks and is audited with before and after', async () => {
    const res = await asAdmin('patch', `/api/users/${t.users.engineer}`).send({ role: 'supervisor', reason: 'Moved to shift supervision' });
    expect(res.body.user.role).toBe('supervisor');
    const entry = await AuditEntry.findOne({ where: { action: 'user.update', entityId: String(t.users.engineer) } });
    expect(entry?.beforeJson).toMatchObject({ role: 'engineer' });
    expect(entry?.afterJson).toMatchObject({ role: 'supervisor' });
    expect(entry?.reason).toBe('Moved to shift supervision');
  });

  it('when an admin changes a role or disables someone without a reason, then 400 with the field named and nothing changes', async () => {
    for (const change of [{ role: 'admin' }, { disabled: true }, { role: 'admin', reason: ' x ' }]) {
      const res = await asAdmin('patch', `/api/users/${t.users.operator}`).send(change);
      expect(res.status).toBe(400);
      expect(res.headers['content-type']).toMatch(/problem\+json/);
      expect(res.body.errors).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'reason' })]));
    }
    const list = (await asAdmin('get', '/api/users').send()).body.users as Array<{ id: number; role: string; disabled: boolean }>;
    expect(list.find((u) => u.id === t.users.operator)).toMatchObject({ role: 'operator', disabled: false });
  });

  it('when an admin tries to disable themselves, then 400', async () => {
    expect((await asAdmin('patch', `/api/users/${t.users.admin}`).send({ disabled: true, reason: 'Left the site' })).status).toBe(400);
  });

  it('when the user does not exist or the body is empty, then 404 or 400', async () => {
    expect((await asAdmin('patch', '/api/users/99999').send({ role: 'operator', reason: 'Test change' })).status).toBe(404);
    expect((await asAdmin('patch', `/api/users/${t.users.operator}`).send({})).status).toBe(400);
    expect((await asAdmin('patch', '/api/users/abc').send({ role: 'operator', reason: 'Test change' })).status).toBe(400);
  });
});
