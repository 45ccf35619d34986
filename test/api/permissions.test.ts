import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { type Role, roles } from '@/telemetry/roles';
import { testApp } from '@/test/helpers/app';

/**
 * Every guarded route × every role. The expected roles are written out here, apart
 * from the permission table in the code, so removing or loosening a guard fails.
 */
type Case = { method: 'get' | 'post' | 'patch' | 'put' | 'delete'; path: string; allowed: Role[]; body?: object };
const everyone: Role[] = [...roles];
const cases: Case[] = [
  { method: 'get', path: '/api/sites', allowed: everyone },
  { method: 'get', path: '/api/sites/1', allowed: everyone },
  { method: 'get', path: '/api/sites/board', allowed: everyone },
  { method: 'get', path: '/api/people', allowed: ['admin'] },
  { method: 'post', path: '/api/people', allowed: ['admin'], body: {} },
  { method: 'patch', path: '/api/people/1', allowed: ['admin'], body: {} },
  { method: 'post', path: '/api/people/999/reset', allowed: ['admin'] },
  { method: 'post', path: '/api/people/invite', allowed: ['admin'], body: {} },
  { method: 'get', path: '/api/people/me/notifications', allowed: everyone },
  {
    method: 'put',
    path: '/api/people/me/notifications',
    allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'],
    body: {},
  },
  { method: 'get', path: '/api/sites/999/on-call', allowed: everyone },
  { method: 'put', path: '/api/sites/999/on-call', allowed: ['admin'], body: {} },
  { method: 'get', path: '/api/controllers', allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'] },
  { method: 'post', path: '/api/controllers', allowed: ['admin', 'integrator'], body: {} },
  { method: 'post', path: '/api/imports/controllers', allowed: ['admin', 'integrator'] },
  { method: 'get', path: '/api/imports/controllers/template', allowed: ['admin', 'integrator'] },
  { method: 'post', path: '/api/imports/network', allowed: ['admin', 'engineer'] },
  { method: 'get', path: '/api/imports/network/template', allowed: ['admin', 'engineer'] },
  { method: 'post', path: '/api/sites', allowed: ['admin', 'engineer'], body: {} },
  { method: 'patch', path: '/api/sites/999', allowed: ['admin', 'engineer'], body: {} },
  { method: 'delete', path: '/api/sites/999', allowed: ['admin', 'engineer'] },
  { method: 'post', path: '/api/sites/999/archive', allowed: ['admin', 'engineer'], body: {} },
  { method: 'post', path: '/api/sites/999/restore', allowed: ['admin', 'engineer'] },
  { method: 'post', path: '/api/sites/999/antennas', allowed: ['admin', 'engineer'], body: {} },
  { method: 'patch', path: '/api/sites/999/antennas/999', allowed: ['admin', 'engineer'], body: {} },
  { method: 'post', path: '/api/sites/999/antennas/999/archive', allowed: ['admin', 'engineer'], body: {} },
  { method: 'delete', path: '/api/sites/999/antennas/999', allowed: ['admin', 'engineer'] },
  { method: 'get', path: '/api/sites/regions', allowed: everyone },
  { method: 'post', path: '/api/sites/regions/rename', allowed: ['admin', 'engineer'], body: {} },
  { method: 'get', path: '/api/sites/999/former-controllers', allowed: everyone },
  { method: 'post', path: '/api/controllers/999/move', allowed: ['admin', 'engineer', 'integrator'], body: {} },
  {
    method: 'get',
    path: '/api/controllers/999/placements',
    allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'],
  },
  { method: 'get', path: '/api/dev/outbox', allowed: ['admin'] },
  {
    method: 'get',
    path: '/api/controllers/999',
    allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'],
  },
  { method: 'post', path: '/api/controllers/999/password', allowed: ['admin', 'integrator'] },
  { method: 'post', path: '/api/controllers/999/decommission', allowed: ['admin', 'integrator'] },
  { method: 'put', path: '/api/controllers/999/calibration', allowed: ['admin', 'integrator', 'engineer'], body: {} },
  { method: 'get', path: '/api/controllers/999/readings', allowed: everyone },
  { method: 'get', path: '/api/controllers/999/energy', allowed: everyone },
  {
    method: 'get',
    path: '/api/controllers/999/commands',
    allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'],
  },
  { method: 'post', path: '/api/controllers/999/heater', allowed: ['admin', 'engineer'], body: {} },
  { method: 'post', path: '/api/controllers/999/service', allowed: ['admin', 'engineer'], body: {} },
  { method: 'get', path: '/api/alarms', allowed: everyone },
  { method: 'get', path: '/api/alarms/999', allowed: everyone },
  { method: 'get', path: '/api/alarms/attachments/999', allowed: everyone },
  { method: 'post', path: '/api/alarms/999/ack', allowed: ['admin', 'engineer', 'operator', 'technician'] },
  {
    method: 'post',
    path: '/api/alarms/ack',
    allowed: ['admin', 'engineer', 'operator', 'technician'],
    body: { ids: [999] },
  },
  { method: 'post', path: '/api/alarms/999/shelve', allowed: ['admin', 'engineer', 'operator'], body: {} },
  { method: 'post', path: '/api/alarms/999/unshelve', allowed: ['admin', 'engineer', 'operator'] },
  { method: 'get', path: '/api/rules', allowed: ['admin', 'engineer', 'operator'] },
  { method: 'get', path: '/api/rules/effective', allowed: everyone },
  { method: 'post', path: '/api/rules', allowed: ['admin', 'engineer'], body: {} },
  { method: 'post', path: '/api/rules/preview', allowed: ['admin', 'engineer'], body: {} },
  { method: 'put', path: '/api/rules/999', allowed: ['admin', 'engineer'], body: {} },
  { method: 'delete', path: '/api/rules/999', allowed: ['admin', 'engineer'] },
  { method: 'get', path: '/api/reports/storm', allowed: ['admin', 'engineer', 'operator'] },
  { method: 'get', path: '/api/reports/storm.csv', allowed: ['admin', 'engineer', 'operator'] },
  { method: 'get', path: '/api/reports/alarm-health', allowed: ['admin', 'engineer', 'operator'] },
  { method: 'get', path: '/api/reports/energy', allowed: ['admin', 'engineer', 'operator'] },
  { method: 'get', path: '/api/reports/readings.csv', allowed: ['admin', 'engineer'] },
  { method: 'get', path: '/api/reports/alarms.csv', allowed: ['admin', 'engineer'] },
  { method: 'get', path: '/api/settings', allowed: everyone },
  { method: 'put', path: '/api/settings', allowed: ['admin'], body: {} },
  { method: 'get', path: '/api/visits', allowed: ['admin', 'engineer', 'operator', 'technician', 'kiosk'] },
  { method: 'get', path: '/api/sites/999/hazard', allowed: everyone },
  { method: 'post', path: '/api/visits/site/999', allowed: ['admin', 'engineer', 'technician'], body: {} },
  { method: 'post', path: '/api/visits/999/check-out', allowed: ['admin', 'engineer', 'technician'] },
  { method: 'get', path: '/api/auth/me', allowed: everyone },
  { method: 'get', path: '/api/auth/tokens', allowed: everyone },
  {
    method: 'post',
    path: '/api/auth/tokens',
    allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'],
    body: {},
  },
  { method: 'delete', path: '/api/auth/tokens/AAAAAAAAAAAA', allowed: everyone },
];

it('health answers everyone, signed in or not, with its parts', async () => {
  const res = await t.request().get('/api/health');
  expect(res.status).toBe(200);
  expect(res.body.parts.map((p: { part: string }) => p.part)).toContain('database');
});

let t: Awaited<ReturnType<typeof testApp>>;
beforeAll(async () => {
  t = await testApp();
});
afterAll(async () => {
  await t.close();
});

describe('route × role', () => {
  for (const c of cases) {
    it(`${c.method.toUpperCase()} ${c.path}`, async () => {
      const anon = await t.request()[c.method](c.path).send(c.body);
      expect(anon.status, 'without a session').toBe(401);
      for (const role of roles) {
        const res = await t.request()[c.method](c.path).set(t.as(role)).send(c.body);
        // allowed: a success, or the answer a valid request can expect here (bad input, no such thing,
        // a conflict, too large, or a file with errors); never a 5xx, never a guard's 401/403
        if (c.allowed.includes(role)) {
          const ok = (res.status >= 200 && res.status < 300) || [400, 404, 409, 413, 422].includes(res.status);
          expect(ok, `${role}: ${res.status} ${JSON.stringify(res.body)}`).toBe(true);
        } else expect(res.status, `${role} should be refused`).toBe(403);
      }
    });
  }
});

/** "/api/sites/999/antennas/999" matches "/sites/{id}/antennas/{antennaId}" */
// a literal path (/alarms/ack) before a templated one that would also match it (/alarms/{id})
const docPathFor = (paths: string[], concrete: string) =>
  paths.find((p) => `/api${p}` === concrete) ??
  paths.find((p) => new RegExp(`^/api${p.replace(/\{[^}]+\}/g, '[^/]+')}$`).test(concrete));
const publicRoutes = [
  'post /auth/sign-in',
  'post /auth/accept-invite',
  'post /auth/reset-request',
  'get /health',
  'get /openapi.json',
  'get /asyncapi.json',
];

describe('the OpenAPI document and the router agree', () => {
  it('documents every route with a summary and the roles this table allows, and nothing the table does not know', async () => {
    const res = await t.request().get('/api/openapi.json');
    expect(res.status).toBe(200);
    expect(res.body.openapi).toBe('3.1.0');
    const doc = res.body as {
      paths: Record<string, Record<string, { summary: string; 'x-roles': string[]; description: string }>>;
    };
    const paths = Object.keys(doc.paths);
    const documented = paths.flatMap((p) => Object.keys(doc.paths[p]).map((m) => `${m} ${p}`));
    expect(documented.length).toBeGreaterThanOrEqual(60);
    const seen = new Set<string>();
    for (const c of cases) {
      const p = docPathFor(paths, c.path.replace(/\?.*$/, ''));
      expect(p, `${c.method} ${c.path} in the document`).toBeDefined();
      const op = doc.paths[p!][c.method];
      expect(op, `${c.method} ${p}`).toBeDefined();
      expect(op.summary).not.toMatch(/^(GET|POST|PUT|PATCH|DELETE) /);
      expect([...op['x-roles']].sort(), `${c.method} ${p} roles`).toEqual([...c.allowed].sort());
      seen.add(`${c.method} ${p}`);
    }
    // every documented route is either in the route × role table above or public on purpose
    // signing out would end the sessions this table uses; test/api/sessions.test.ts covers them
    const endsSession = ['post /auth/sign-out', 'post /auth/sign-out-everywhere'];
    for (const d of endsSession)
      expect(doc.paths[d.split(' ')[1]][d.split(' ')[0]]['x-roles'].length).toBe(roles.length);
    for (const d of publicRoutes) expect(doc.paths[d.split(' ')[1]][d.split(' ')[0]]['x-roles']).toEqual([]);
    const untested = documented.filter((d) => !seen.has(d) && !publicRoutes.includes(d) && !endsSession.includes(d));
    expect(untested).toEqual([]);
  });

  it('names the request schemas: a site body lists its fields and the time zone', async () => {
    const doc = (await t.request().get('/api/openapi.json')).body;
    const body = doc.paths['/sites'].post.requestBody.content['application/json'].schema;
    expect(body.required).toEqual(expect.arrayContaining(['code', 'name', 'latitude', 'longitude', 'timeZone']));
    expect(doc.paths['/sites/{id}'].get.parameters[0]).toMatchObject({ name: 'id', in: 'path', required: true });
    expect(doc.paths['/imports/network'].post.requestBody.content['multipart/form-data']).toBeDefined();
  });

  it('the AsyncAPI document carries the wire schemas and the four topics', async () => {
    const doc = (await t.request().get('/api/asyncapi.json')).body;
    expect(doc.asyncapi).toBe('3.0.0');
    expect(Object.values(doc.channels).map((c) => (c as { address: string }).address)).toEqual([
      'thawline/v1/{serial}/telemetry',
      'thawline/v1/{serial}/status',
      'thawline/v1/{serial}/command',
      'thawline/v1/{serial}/command/result',
    ]);
    const reading = doc.components.messages.readings.payload.anyOf[0];
    expect(reading.required).toEqual(expect.arrayContaining(['v', 'seq', 'boot', 'ts', 'forwardW', 'reflectedW']));
  });
});
