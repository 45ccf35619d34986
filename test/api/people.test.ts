import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { type TestServer, testServer } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

let t: TestServer;
beforeAll(async () => {
  t = await testServer();
});
afterAll(async () => {
  await t?.close();
});

describe('people, invitations and on-call lists', () => {
  it('an admin invites by e-mail; the link sets a password once', async () => {
    const res = await t
      .request()
      .post('/api/people/invite')
      .set(t.as('admin'))
      .send({ email: 'New.Tech@Demo.Thawline.Test', name: 'Ines Marlow', role: 'technician' });
    expect(res.status).toBe(201);
    const mail = await until(
      () => t.mail.messages.find((m) => m.to.includes('new.tech@demo.thawline.test')),
      'invitation e-mail',
    );
    const token = /welcome\?token=([A-Za-z0-9_-]+)/.exec(mail.raw.replace(/=\r?\n/g, ''))![1];
    expect(
      (
        await t
          .request()
          .post('/api/auth/sign-in')
          .send({ email: 'new.tech@demo.thawline.test', password: 'chosen-password-1' })
      ).status,
    ).toBe(401);
    const accept = await t.request().post('/api/auth/accept-invite').send({ token, password: 'chosen-password-1' });
    expect(accept.status).toBe(200);
    expect(
      (
        await t
          .request()
          .post('/api/auth/sign-in')
          .send({ email: 'new.tech@demo.thawline.test', password: 'chosen-password-1' })
      ).status,
    ).toBe(200);
    expect(
      (await t.request().post('/api/auth/accept-invite').send({ token, password: 'another-password' })).status,
    ).toBe(400);
    expect(
      (
        await t
          .request()
          .post('/api/people/invite')
          .set(t.as('admin'))
          .send({ email: 'new.tech@demo.thawline.test', name: 'x', role: 'operator' })
      ).status,
    ).toBe(409);
  });

  it('sets a site on-call order, refusing unknown or repeated people', async () => {
    const people = (await t.request().get('/api/people').set(t.as('admin'))).body.people;
    const op = people.find((p: { role: string }) => p.role === 'operator');
    const tech = people.find((p: { email: string }) => p.email === 'tech@demo.thawline.test');
    const res = await t
      .request()
      .put('/api/sites/2/on-call')
      .set(t.as('admin'))
      .send({ personIds: [op.id, tech.id] });
    expect(res.body.onCall.map((p: { id: number }) => p.id)).toEqual([op.id, tech.id]);
    expect(
      (
        await t
          .request()
          .put('/api/sites/2/on-call')
          .set(t.as('admin'))
          .send({ personIds: [op.id, op.id] })
      ).status,
    ).toBe(400);
    expect(
      (
        await t
          .request()
          .put('/api/sites/2/on-call')
          .set(t.as('admin'))
          .send({ personIds: [99999] })
      ).status,
    ).toBe(400);
    expect((await t.request().get('/api/sites/2/on-call').set(t.as('technician'))).body.onCall).toHaveLength(2);
  });

  it('each person chooses e-mail per priority; defaults page for high and critical', async () => {
    expect((await t.request().get('/api/people/me/notifications').set(t.as('technician'))).body.prefs).toEqual({
      critical: true,
      high: true,
      medium: false,
      low: false,
    });
    const res = await t
      .request()
      .put('/api/people/me/notifications')
      .set(t.as('technician'))
      .send({ critical: true, high: false, medium: true, low: false });
    expect(res.body.prefs).toEqual({ critical: true, high: false, medium: true, low: false });
  });

  it('operators may override heaters only once an administrator allows it', async () => {
    const body = { mode: 'forced-on', untilMinutes: 30, reason: 'pre-heat before the storm' };
    expect((await t.request().post('/api/controllers/1/heater').set(t.as('operator')).send(body)).status).toBe(403);
    expect(
      (await t.request().put('/api/settings').set(t.as('operator')).send({ operatorsMayCommandHeaters: true })).status,
    ).toBe(403);
    const on = await t.request().put('/api/settings').set(t.as('admin')).send({ operatorsMayCommandHeaters: true });
    expect(on.body.settings.operatorsMayCommandHeaters).toBe(true);
    expect((await t.request().post('/api/controllers/1/heater').set(t.as('operator')).send(body)).status).toBe(202);
    expect((await t.request().post('/api/controllers/1/heater').set(t.as('technician')).send(body)).status).toBe(403);
    await t.request().put('/api/settings').set(t.as('admin')).send({ operatorsMayCommandHeaters: false });
    expect((await t.request().post('/api/controllers/1/heater').set(t.as('operator')).send(body)).status).toBe(403);
  });

  it('changing a role or deactivating is audited and ends that person’s sessions', async () => {
    const people = (await t.request().get('/api/people').set(t.as('admin'))).body.people;
    const eng = people.find((p: { role: string }) => p.role === 'engineer');
    expect(
      (await t.request().patch(`/api/people/${eng.id}`).set(t.as('admin')).send({ role: 'operator' })).body.person.role,
    ).toBe('operator');
    expect((await t.request().get('/api/auth/me').set(t.as('engineer'))).status).toBe(401);
    const admin = people.find((p: { role: string }) => p.role === 'admin');
    expect((await t.request().patch(`/api/people/${admin.id}`).set(t.as('admin')).send({ active: false })).status).toBe(
      400,
    );
  });
});
