import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { testApp } from '@/test/helpers/app';
import { sessionFromSetCookie } from '@/test/helpers/cookies';

let t: Awaited<ReturnType<typeof testApp>>;
beforeAll(async () => {
  t = await testApp();
});
afterAll(async () => {
  await t.close();
});

describe('sign-in and sessions', () => {
  it('signs in with the right password, sets an httpOnly cookie and answers /me', async () => {
    const res = await t
      .request()
      .post('/api/auth/sign-in')
      .send({ email: 'Operator@Demo.Thawline.Test', password: 'thawline-demo' });
    expect(res.status).toBe(200);
    expect(res.body.person.role).toBe('operator');
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/thawline_session=/);
    expect(cookie).toMatch(/HttpOnly/i);
    const me = await t.request().get('/api/auth/me').set('Cookie', cookie.split(';')[0]);
    expect(me.status).toBe(200);
    expect(me.body.person.email).toBe('operator@demo.thawline.test');
  });

  it('refuses a wrong password and an unknown person with the same words', async () => {
    const a = await t
      .request()
      .post('/api/auth/sign-in')
      .send({ email: 'operator@demo.thawline.test', password: 'nope-nope' });
    const b = await t
      .request()
      .post('/api/auth/sign-in')
      .send({ email: 'nobody@demo.thawline.test', password: 'nope-nope' });
    expect(a.status).toBe(401);
    expect(b.status).toBe(401);
    expect(a.body.error).toEqual(b.body.error);
    expect(a.body.error.code).toBe('unauthenticated');
  });

  it('explains a malformed body field by field', async () => {
    const res = await t.request().post('/api/auth/sign-in').send({ email: 'not-an-address' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_request');
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['email', 'password']);
  });

  it('ends a session on sign-out', async () => {
    const res = await t
      .request()
      .post('/api/auth/sign-in')
      .send({ email: 'tech@demo.thawline.test', password: 'thawline-demo' });
    expect(res.body.token).toBeUndefined();
    const auth = { Cookie: `thawline_session=${sessionFromSetCookie(res.headers['set-cookie'])}` };
    expect((await t.request().post('/api/auth/sign-out').set(auth)).status).toBe(204);
    expect((await t.request().get('/api/auth/me').set(auth)).status).toBe(401);
  });

  it('a deactivated person loses their sessions at once', async () => {
    const people = await t.request().get('/api/people').set(t.as('admin'));
    const integrator = people.body.people.find((p: { role: string }) => p.role === 'integrator');
    const res = await t.request().patch(`/api/people/${integrator.id}`).set(t.as('admin')).send({ active: false });
    expect(res.status).toBe(200);
    expect(res.body.person.active).toBe(false);
    expect((await t.request().get('/api/sites').set(t.as('integrator'))).status).toBe(401);
    const audit = await t.db('audit_log').where({ action: 'person.update', subject: `person:${integrator.id}` });
    expect(audit).toHaveLength(1);
  });

  it('answers unknown API routes with a typed 404, and a deep link with the web app', async () => {
    const api = await t.request().get('/api/nothing-here');
    expect(api.status).toBe(404);
    expect(api.body.error.code).toBe('not_found');
    const page = await t.request().get('/sites/3');
    expect(page.status).toBe(200);
    expect(page.text).toContain('<div id="root">');
  });
});
