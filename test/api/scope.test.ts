import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import WebSocket from 'ws';

import { demoController, liveSocket, reading, refusedStatus, type TestServer, testServer } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

let t: TestServer;
beforeAll(async () => {
  t = await testServer({ ingest: { flushMs: 50 } });
  // the demo technician leaves the on-call list of Kettle Pike (site 1)
  const tech = await t.db('people').where({ email: 'tech@demo.thawline.test' }).first();
  await t.db('site_on_call').where({ site_id: 1, person_id: tech.id }).delete();
});
afterAll(async () => {
  await t?.close();
});

describe('a technician sees the sites they are on call for', () => {
  it('in the site list, the Board snapshot and a site page', async () => {
    const list = (await t.request().get('/api/sites').set(t.as('technician'))).body.sites.map(
      (s: { id: number }) => s.id,
    );
    expect(list).not.toContain(1);
    expect(list).toContain(2);
    expect(
      (await t.request().get('/api/sites').set(t.as('operator'))).body.sites.map((s: { id: number }) => s.id),
    ).toContain(1);
    expect((await t.request().get('/api/sites/1').set(t.as('technician'))).status).toBe(404);
    const board = (await t.request().get('/api/sites/board').set(t.as('technician'))).body.sites.map(
      (s: { siteId: number }) => s.siteId,
    );
    expect(board).not.toContain(1);
  });

  it('and on /live only their sites’ readings arrive', async () => {
    const frames: { type: string; items?: { siteId: number }[] }[] = [];
    expect(await refusedStatus(liveSocket(t, null))).toBe(401);
    // the session is taken from the cookie only, never from the URL (where it would end up in logs)
    expect(await refusedStatus(new WebSocket(`${t.url.replace('http', 'ws')}/live?token=${t.token('operator')}`))).toBe(
      401,
    );
    const nowhere = new WebSocket(`${t.url.replace('http', 'ws')}/nowhere`, {
      headers: { Cookie: `thawline_session=${t.token('operator')}` },
    });
    expect(await refusedStatus(nowhere)).toBe(404);
    const tech = liveSocket(t, 'technician');
    tech.on('message', (d) => frames.push(JSON.parse(String(d))));
    await until(() => frames.some((f) => f.type === 'hello'), 'hello frame');
    const a = await demoController(t, 'KTP-1');
    const b = await demoController(t, 'BRC-1');
    await a.publishAsync('thawline/v1/KTP-1/telemetry', JSON.stringify(reading({ seq: 0 })), { qos: 1 });
    await b.publishAsync('thawline/v1/BRC-1/telemetry', JSON.stringify(reading({ seq: 0 })), { qos: 1 });
    await until(
      () => frames.some((f) => f.type === 'readings' && f.items!.some((i) => i.siteId === 2)),
      'Brindle Crag reading',
    );
    await new Promise((r) => setTimeout(r, 300));
    expect(
      frames
        .filter((f) => f.type === 'readings')
        .flatMap((f) => f.items!)
        .map((i) => i.siteId),
    ).not.toContain(1);
    tech.close();
    await a.endAsync();
    await b.endAsync();
  });
});
