import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { roles, type Role } from '../../telemetry/roles';
import { testApp } from '../helpers/app';

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
  { method: 'put', path: '/api/people/me/notifications', allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'], body: {} },
  { method: 'get', path: '/api/sites/999/on-call', allowed: everyone },
  { method: 'put', path: '/api/sites/999/on-call', allowed: ['admin'], body: {} },
  { method: 'get', path: '/api/controllers', allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'] },
  { method: 'post', path: '/api/controllers', allowed: ['admin', 'integrator'], body: {} },
  { method: 'post', path: '/api/controllers/bulk', allowed: ['admin', 'integrator'] },
  { method: 'get', path: '/api/controllers/999', allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'] },
  { method: 'post', path: '/api/controllers/999/password', allowed: ['admin', 'integrator'] },
  { method: 'post', path: '/api/controllers/999/decommission', allowed: ['admin', 'integrator'] },
  { method: 'put', path: '/api/controllers/999/calibration', allowed: ['admin', 'integrator', 'engineer'], body: {} },
  { method: 'get', path: '/api/controllers/999/readings', allowed: everyone },
  { method: 'get', path: '/api/controllers/999/commands', allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'] },
  { method: 'post', path: '/api/controllers/999/heater', allowed: ['admin', 'engineer'], body: {} },
  { method: 'post', path: '/api/controllers/999/service', allowed: ['admin', 'engineer'], body: {} },
  { method: 'get', path: '/api/alarms', allowed: everyone },
  { method: 'get', path: '/api/alarms/999', allowed: everyone },
  { method: 'get', path: '/api/alarms/attachments/999', allowed: everyone },
  { method: 'post', path: '/api/alarms/999/ack', allowed: ['admin', 'engineer', 'operator', 'technician'] },
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
  { method: 'post', path: '/api/auth/tokens', allowed: ['admin', 'engineer', 'operator', 'technician', 'integrator'], body: {} },
  { method: 'delete', path: '/api/auth/tokens/AAAAAAAAAAAA', allowed: everyone },
];

it('health answers everyone, signed in or not, with its parts', async () => {
  const res = await t.request().get('/api/health');
  expect(res.status).toBe(200);
  expect(res.body.parts.map((p: { part: string }) => p.part)).toContain('database');
});

let t: Awaited<ReturnType<typeof testApp>>;
beforeAll(async () => { t = await testApp(); });
afterAll(async () => { await t.close(); });

describe('route × role', () => {
  for (const c of cases) {
    it(`${c.method.toUpperCase()} ${c.path}`, async () => {
      const anon = await t.request()[c.method](c.path).send(c.body);
      expect(anon.status, 'without a session').toBe(401);
      for (const role of roles) {
        const res = await t.request()[c.method](c.path).set(t.as(role)).send(c.body);
        // allowed: answered, and answered well (a 500 is not "allowed")
        if (c.allowed.includes(role)) {
          expect([401, 403], `${role} should pass the guard`).not.toContain(res.status);
          expect(res.status, `${role}: ${JSON.stringify(res.body)}`).toBeLessThan(500);
        }
        else expect(res.status, `${role} should be refused`).toBe(403);
      }
    });
  }
});
