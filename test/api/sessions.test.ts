import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { demoPassword } from '@/seeds/01_people';
import { sessionFromSetCookie } from '@/test/helpers/cookies';
import { liveSocket, type TestServer, testServer } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

/** Sessions and credentials that really end: browser sessions, API tokens, live sockets and device passwords. */
let t: TestServer;
beforeAll(async () => {
  t = await testServer();
});
afterAll(async () => {
  await t?.close();
});

const signIn = async (email: string, password = demoPassword) => {
  const res = await t.request().post('/api/auth/sign-in').send({ email, password });
  return {
    res,
    cookie:
      res.status === 200 ? { Cookie: `thawline_session=${sessionFromSetCookie(res.headers['set-cookie'])}` } : null,
  };
};

describe('browser sessions', () => {
  it('a new session id at every sign-in; sign out everywhere ends them all', async () => {
    const a = await signIn('tech@demo.thawline.test');
    const b = await signIn('tech@demo.thawline.test');
    expect(a.cookie!.Cookie).not.toBe(b.cookie!.Cookie);
    expect((await t.request().post('/api/auth/sign-out-everywhere').set(b.cookie!)).status).toBe(204);
    expect((await t.request().get('/api/auth/me').set(a.cookie!)).status).toBe(401);
    expect((await t.request().get('/api/auth/me').set(b.cookie!)).status).toBe(401);
  });

  it('a signed-out session stops receiving on /live at once', async () => {
    const s = await signIn('operator@demo.thawline.test');
    const token = s.cookie!.Cookie.split('=')[1];
    const ws = liveSocket({ ...t, token: () => token } as TestServer, 'operator');
    const closed = new Promise<number>((resolve) => ws.on('close', (code: number) => resolve(code)));
    await new Promise((r) => ws.once('open', r));
    expect((await t.request().post('/api/auth/sign-out').set(s.cookie!)).status).toBe(204);
    expect(await closed).toBe(4401);
  });

  it('failed sign-ins are limited per account; a good sign-in is not counted', async () => {
    for (let i = 0; i < 3; i++) expect((await signIn('integrator@demo.thawline.test')).res.status).toBe(200);
    for (let i = 0; i < 10; i++)
      expect((await signIn('integrator@demo.thawline.test', `wrong-${i}-password`)).res.status).toBe(401);
    expect((await signIn('integrator@demo.thawline.test')).res.status).toBe(429);
    // another account from the same address still signs in
    expect((await signIn('admin@demo.thawline.test')).res.status).toBe(200);
    expect(
      await t
        .db('audit_log')
        .where({ action: 'auth.sign-in-failed', subject: 'email:integrator@demo.thawline.test' })
        .count({ n: '*' })
        .first(),
    ).toEqual({ n: 10 });
  });
});

describe('API tokens for scripts', () => {
  it('are named, shown once, work as Bearer only, and revoke', async () => {
    const made = await t.request().post('/api/auth/tokens').set(t.as('engineer')).send({ name: 'nightly export' });
    expect(made.status).toBe(201);
    const { id, token } = made.body.token;
    const bearer = { Authorization: `Bearer ${token}` };
    expect((await t.request().get('/api/sites').set(bearer)).status).toBe(200);
    // a token is not a cookie, and a browser session is not a Bearer token
    expect(
      (
        await t
          .request()
          .get('/api/sites')
          .set({ Cookie: `thawline_session=${token}` })
      ).status,
    ).toBe(401);
    expect(
      (
        await t
          .request()
          .get('/api/sites')
          .set({ Authorization: `Bearer ${t.token('engineer')}` })
      ).status,
    ).toBe(401);
    const list = (await t.request().get('/api/auth/tokens').set(t.as('engineer'))).body.tokens;
    expect(list).toEqual([expect.objectContaining({ id, name: 'nightly export' })]);
    expect(JSON.stringify(list)).not.toContain(token);
    expect((await t.request().delete(`/api/auth/tokens/${id}`).set(t.as('engineer'))).status).toBe(204);
    expect((await t.request().get('/api/sites').set(bearer)).status).toBe(401);
  });

  it('a wall-screen sign-in gets none, and can never be promoted', async () => {
    expect((await t.request().post('/api/auth/tokens').set(t.as('kiosk')).send({ name: 'x' })).status).toBe(403);
    const wall = await t.db('people').where({ role: 'kiosk' }).first();
    const res = await t.request().patch(`/api/people/${wall.id}`).set(t.as('admin')).send({ role: 'admin' });
    expect(res.status).toBe(400);
    expect((await t.db('people').where({ id: wall.id }).first()).role).toBe('kiosk');
  });

  it('names with control or direction characters, e-mails over 254 characters and lenient ids are refused', async () => {
    expect(
      (await t.request().post('/api/auth/tokens').set(t.as('engineer')).send({ name: 'evil\u202Etxt.exe' })).status,
    ).toBe(400);
    expect(
      (await t.request().post('/api/auth/tokens').set(t.as('engineer')).send({ name: 'nul\u0000byte' })).status,
    ).toBe(400);
    expect(
      (
        await t
          .request()
          .post('/api/people/invite')
          .set(t.as('admin'))
          .send({ email: `${'a'.repeat(250)}@x.example`, name: 'Long', role: 'operator' })
      ).status,
    ).toBe(400);
    for (const id of ['%201', '0x10', '1e1', '01'])
      expect((await t.request().get(`/api/controllers/${id}`).set(t.as('admin'))).status, id).toBe(400);
  });
});

describe('device passwords', () => {
  it('rotation disconnects the device at once and the old password no longer connects', async () => {
    const c = await t.db('controllers').where({ serial: 'LQB-1' }).first();
    const first = await t.request().post(`/api/controllers/${c.id}/password`).set(t.as('integrator'));
    const password = first.body.mqtt.password;
    const device = await mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, {
      username: 'LQB-1',
      password,
      reconnectPeriod: 0,
    });
    const dropped = new Promise<void>((r) => device.once('close', () => r()));
    const second = await t.request().post(`/api/controllers/${c.id}/password`).set(t.as('integrator'));
    expect(second.status).toBe(200);
    await dropped;
    await expect(
      mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, { username: 'LQB-1', password, reconnectPeriod: 0 }),
    ).rejects.toThrow();
    const again = await mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, {
      username: 'LQB-1',
      password: second.body.mqtt.password,
      reconnectPeriod: 0,
    });
    await again.endAsync();
  });
});

/** The link's token in an e-mail as sent (quoted-printable: soft line breaks, = written =3D). */
const linkToken = (raw: string) =>
  /welcome\?token=([A-Za-z0-9_-]+)/.exec(raw.replace(/=\r?\n/g, '').replace(/=3D/g, '='))![1];

describe('password reset', () => {
  it('e-mails a one-time link that sets a new password once, ends other sessions, and is not kept after sending', async () => {
    const before = t.mail.messages.length;
    expect(
      (await t.request().post('/api/auth/reset-request').send({ email: 'nobody@demo.thawline.test' })).status,
    ).toBe(202);
    const res = await t.request().post('/api/auth/reset-request').send({ email: 'operator@demo.thawline.test' });
    expect(res.status).toBe(202);
    const mail = await until(
      () => t.mail.messages.slice(before).find((m) => m.to.includes('operator@demo.thawline.test')),
      'reset e-mail',
    );
    expect(t.mail.messages.slice(before).filter((m) => m.to.includes('nobody@demo.thawline.test'))).toEqual([]);
    const token = linkToken(mail.raw);
    await until(
      async () =>
        !JSON.stringify(await t.db('outbox').where({ to: 'operator@demo.thawline.test' }).pluck('body')).includes(
          token,
        ),
      'link removed from the outbox',
    );
    // five people racing with the same link: exactly one sets the password
    const tries = await Promise.all(
      Array.from({ length: 5 }, (_, i) =>
        t
          .request()
          .post('/api/auth/accept-invite')
          .send({ token, password: `new-password-${i}-long` }),
      ),
    );
    expect(tries.map((r) => r.status).sort()).toEqual([200, 400, 400, 400, 400]);
    expect((await t.request().get('/api/auth/me').set(t.as('operator'))).status).toBe(401);
    const winner = tries.findIndex((r) => r.status === 200);
    expect((await signIn('operator@demo.thawline.test', `new-password-${winner}-long`)).res.status).toBe(200);
  });

  it('a deactivated person’s link does nothing', async () => {
    const before = t.mail.messages.length;
    const p = await t.db('people').where({ email: 'engineer@demo.thawline.test' }).first();
    await t.request().post(`/api/people/${p.id}/reset`).set(t.as('admin')).expect(202);
    const mail = await until(
      () => t.mail.messages.slice(before).find((m) => m.to.includes('engineer@demo.thawline.test')),
      'reset e-mail',
    );
    const token = linkToken(mail.raw);
    await t.request().patch(`/api/people/${p.id}`).set(t.as('admin')).send({ active: false }).expect(200);
    expect(
      (await t.request().post('/api/auth/accept-invite').send({ token, password: 'sneaky-password-1' })).status,
    ).toBe(400);
    // refused for the deactivation: the link itself is still unused
    expect((await t.db('invites').where({ person_id: p.id }).orderBy('expires_at', 'desc').first()).used_at).toBeNull();
  });
});
