import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { roles } from '@/telemetry/roles';
import { parseTelemetry, readingTimeProblem } from '@/telemetry/wire';
import { demoController, reading, type TestServer, testServer } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

/**
 * Property-based probes of the running server: 10,000 generated API requests over
 * every route and role, and 10,000 generated MQTT payloads from a signed-in device.
 * Whatever comes in: no 5xx, nothing from inside the server in an answer, the
 * server keeps serving, and only valid readings are stored, once each.
 */
let t: TestServer;
beforeAll(async () => {
  t = await testServer({ ingest: { flushMs: 50, countersMs: 100 } });
});
afterAll(async () => {
  await t?.close();
});

const routes: [string, string][] = [
  ['get', '/api/health'],
  ['get', '/api/auth/me'],
  ['post', '/api/auth/sign-in'],
  ['post', '/api/auth/accept-invite'],
  ['post', '/api/auth/reset-request'],
  ['get', '/api/auth/tokens'],
  ['post', '/api/auth/tokens'],
  ['delete', '/api/auth/tokens/:s'],
  ['get', '/api/sites'],
  ['get', '/api/sites/board'],
  ['get', '/api/sites/:id'],
  ['get', '/api/sites/:id/on-call'],
  ['put', '/api/sites/:id/on-call'],
  ['get', '/api/people'],
  ['post', '/api/people'],
  ['patch', '/api/people/:id'],
  ['post', '/api/people/invite'],
  ['post', '/api/people/:id/reset'],
  ['get', '/api/people/me/notifications'],
  ['put', '/api/people/me/notifications'],
  ['get', '/api/controllers'],
  ['post', '/api/controllers'],
  ['get', '/api/controllers/:id'],
  ['post', '/api/controllers/:id/password'],
  ['put', '/api/controllers/:id/calibration'],
  ['get', '/api/controllers/:id/readings'],
  ['post', '/api/controllers/:id/heater'],
  ['get', '/api/controllers/:id/commands'],
  ['post', '/api/controllers/:id/service'],
  ['get', '/api/alarms'],
  ['get', '/api/alarms/:id'],
  ['get', '/api/alarms/attachments/:id'],
  ['post', '/api/alarms/:id/ack'],
  ['post', '/api/alarms/:id/shelve'],
  ['post', '/api/alarms/:id/unshelve'],
  ['get', '/api/rules'],
  ['get', '/api/rules/effective'],
  ['post', '/api/rules'],
  ['post', '/api/rules/preview'],
  ['put', '/api/rules/:id'],
  ['delete', '/api/rules/:id'],
  ['get', '/api/reports/storm'],
  ['get', '/api/reports/storm.csv'],
  ['get', '/api/reports/alarm-health'],
  ['get', '/api/reports/energy'],
  ['get', '/api/reports/readings.csv'],
  ['get', '/api/reports/alarms.csv'],
  ['get', '/api/settings'],
  ['put', '/api/settings'],
  ['get', '/api/visits'],
  ['get', '/api/sites/:id/hazard'],
  ['post', '/api/visits/site/:id'],
  ['post', '/api/visits/:id/check-out'],
];

const idText = fc.oneof(
  fc.integer({ min: -5, max: 40 }).map(String),
  fc.constantFrom('0x10', ' 1', '1e3', '9'.repeat(30), '%00', '..', 'NaN', '-0'),
  fc.string({ maxLength: 12 }).map(encodeURIComponent),
);
const isoish = fc.oneof(
  fc
    .date({ min: new Date('0001-01-01'), max: new Date('9999-12-31'), noInvalidDate: true })
    .map((d) => d.toISOString()),
  fc.string({ maxLength: 30 }),
);
const queryValue = fc.oneof(idText, isoish, fc.string({ maxLength: 40 }));
const body = fc.oneof(
  fc.json({ maxDepth: 3 }),
  fc
    .record(
      {
        email: fc.oneof(fc.emailAddress(), fc.string({ maxLength: 300 })),
        password: fc.string({ maxLength: 40 }),
        name: fc.string({ maxLength: 200 }),
        role: fc.constantFrom(...roles, 'root'),
      },
      { requiredKeys: [] },
    )
    .map((o) => JSON.stringify(o)),
  fc
    .record(
      {
        note: fc.string({ maxLength: 1200 }),
        reason: fc.string({ maxLength: 600 }),
        until: isoish,
        mode: fc.constantFrom('auto', 'forced-on', 'forced-off', 'x'),
        untilMinutes: fc.integer({ min: -10, max: 100_000 }),
      },
      { requiredKeys: [] },
    )
    .map((o) => JSON.stringify(o)),
);
const request = fc.record({
  route: fc.constantFrom(...routes),
  id: idText,
  role: fc.constantFrom(...roles, null),
  query: fc.dictionary(
    fc.constantFrom('from', 'to', 'site', 'controller', 'points', 'state', 'open', 'limit', 'priority'),
    queryValue,
    { maxKeys: 4 },
  ),
  body,
  contentType: fc.constantFrom(
    'application/json',
    'application/json',
    'text/plain',
    'application/x-www-form-urlencoded',
    'multipart/form-data; boundary=x',
  ),
});

// a stack frame, a module path, SQL, a database error code or a password hash in an answer
const leaks = (text: string) =>
  /\bat [\w.]+ \(|node_modules|\bselect\b.+\bfrom\b|\binsert into\b|\$argon2/i.test(text) ||
  /(^|[^\w-])ER_[A-Z_]{4,}\b/.test(text);

describe('fuzzed API', () => {
  it('10,000 generated requests over every route and role: no 5xx and nothing from inside', async () => {
    const bad: string[] = [];
    await fc.assert(
      fc.asyncProperty(request, async (r) => {
        const [method, template] = r.route;
        const path = template.replace(':id', r.id).replace(':s', r.id);
        let req = t.request()[method as 'get'](path).query(r.query);
        if (r.role) req = req.set(t.as(r.role));
        if (method !== 'get') req = req.set('Content-Type', r.contentType).send(r.body);
        const res = await req;
        const text = res.text ?? '';
        if (res.status >= 500 || leaks(text))
          bad.push(`${method.toUpperCase()} ${path} → ${res.status} ${text.slice(0, 200)}`);
        return true;
      }),
      { numRuns: 10_000, seed: 20261203 },
    );
    expect(bad).toEqual([]);
    expect((await t.request().get('/api/health')).status).toBe(200);
  }, 300_000);
});

describe('fuzzed MQTT payloads', () => {
  it('10,000 generated payloads from a device: only the valid readings are stored, once each', async () => {
    const d = await demoController(t, 'BRC-1');
    const c = await t.db('controllers').where({ serial: 'BRC-1' }).first();
    const now = Date.now();
    // a valid reading of this boot, or one with a field broken, or any JSON, or any bytes
    const valid = fc
      .integer({ min: 0, max: 1_000_000 })
      .map((seq) => reading({ boot: 'fuzz', seq, ts: new Date(now - 1000).toISOString() }));
    const broken = fc
      .tuple(
        valid,
        fc.constantFrom('seq', 'boot', 'ts', 'airTempC', 'forwardW', 'heater', 'v', 'supply'),
        fc.anything(),
      )
      .map(([r, k, v]) => ({ ...r, [k]: v }));
    const payload = fc.oneof(
      valid.map((r) => JSON.stringify(r)),
      broken.map((r) => JSON.stringify(r)),
      fc.json(),
      fc.uint8Array({ maxLength: 300 }).map((b) => Buffer.from(b)),
      fc.array(fc.oneof(valid, broken), { minLength: 1, maxLength: 5 }).map((a) => JSON.stringify(a)),
    );
    const samples = fc.sample(payload, { numRuns: 10_000, seed: 20261203 });
    // what the contract says should be kept: valid readings, the first of each seq
    const expected = new Set<string>();
    let refused = 0;
    for (const p of samples) {
      const parsed = parseTelemetry(p);
      if (!parsed.ok) {
        refused++;
        continue;
      }
      for (const r of parsed.readings)
        if (!readingTimeProblem(Date.parse(r.ts), Date.now(), 90 * 86_400_000)) expected.add(`${r.boot}:${r.seq}`);
    }
    // paced under the per-device rate limit
    for (let i = 0; i < samples.length; i += 500) {
      await Promise.all(
        samples.slice(i, i + 500).map((p) => d.publishAsync('thawline/v1/BRC-1/telemetry', p, { qos: 1 })),
      );
      await new Promise((r) => setTimeout(r, 350));
    }
    const stored = await until(
      async () => {
        const rows = (await t.db('readings').where({ controller_id: c.id }).select('boot', 'seq')).map(
          (r) => `${r.boot}:${r.seq}`,
        );
        return rows.length >= expected.size ? rows : null;
      },
      'every valid reading stored',
      60_000,
    );
    // once each, and nothing else
    expect(new Set(stored).size).toBe(stored.length);
    expect(new Set(stored)).toEqual(expected);
    await until(
      async () => Number((await t.db('controllers').where({ id: c.id }).first()).rejected) >= refused,
      'refused payloads counted',
    );
    expect((await t.request().get('/api/health')).status).toBe(200);
    await d.endAsync();
  }, 300_000);
});
