import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import type { Priority } from '@/telemetry/alarms/machine';
import { alarmQueue } from '@/telemetry/alarms/queue';
import { insertAlarmFlood } from '@/test/helpers/alarms';
import { testApp } from '@/test/helpers/app';

/**
 * A storm floods the list: 30 open alarms across three sites. The one critical
 * alarm is listed first, and a technician acknowledges many at once with one note.
 */
let t: Awaited<ReturnType<typeof testApp>>;
let ids: number[] = [];
let critical = 0;

beforeAll(async () => {
  t = await testApp();
  ({ ids, critical } = await insertAlarmFlood(t.db, [3, 4, 5]));
});
afterAll(async () => {
  await t.close();
});

describe('an alarm flood', () => {
  it('lists the one critical alarm first, then by priority and age', async () => {
    const list = (await t.request().get('/api/alarms').query({ open: '1' }).set(t.as('operator'))).body.alarms as {
      id: number;
      priority: Priority;
    }[];
    const mine = list.filter((a) => ids.includes(a.id));
    expect(mine).toHaveLength(30);
    // the server answers newest first; the list on screen is ordered by telemetry/alarms/queue (unit-tested there)
    const shown = alarmQueue(
      (await t.request().get('/api/alarms').query({ open: '1' }).set(t.as('operator'))).body.alarms,
    );
    expect(shown[0]).toMatchObject({ kind: 'alarm', alarm: { id: critical } });
  });

  it('acknowledges many alarms with one note; one already acknowledged is skipped with its reason', async () => {
    const first = ids[0];
    expect((await t.request().post(`/api/alarms/${first}/ack`).set(t.as('operator'))).status).toBe(200);
    const res = await t
      .request()
      .post('/api/alarms/ack')
      .set(t.as('technician'))
      .send({ ids: ids.slice(0, 12), note: 'Storm on the ridge, crew of two on the way' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.acknowledged).toEqual(ids.slice(1, 12));
    expect(res.body.skipped).toEqual([{ id: first, reason: expect.stringMatching(/acknowledged/i) }]);
    const rows = await t.db('alarms').whereIn('id', ids.slice(1, 12));
    expect(
      rows.every((r) => r.state === 'acknowledged' && r.ack_note === 'Storm on the ridge, crew of two on the way'),
    ).toBe(true);
    const audit = await t
      .db('audit_log')
      .where({ action: 'alarm.ack' })
      .whereIn(
        'subject',
        ids.slice(1, 12).map((id) => `alarm:${id}`),
      );
    expect(audit).toHaveLength(11);
  });

  it('does nothing when one of the alarms does not exist, and names a bad request in words', async () => {
    const res = await t
      .request()
      .post('/api/alarms/ack')
      .set(t.as('operator'))
      .send({ ids: [ids[20], 99_999_999] });
    expect(res.status).toBe(404);
    expect((await t.db('alarms').where({ id: ids[20] }).first()).acked_at).toBeNull();
    const empty = await t.request().post('/api/alarms/ack').set(t.as('operator')).send({ ids: [] });
    expect(empty.status).toBe(400);
    expect(JSON.stringify(empty.body)).toMatch(/Choose at least one alarm/);
  });

  it('shows the rule’s response guidance and the limits in force on the alarm; a save without it keeps it', async () => {
    const rules = (await t.request().get('/api/rules').set(t.as('engineer'))).body.rules;
    const trip = rules.find((r: { kind: string; scope: string }) => r.kind === 'vswr-trip' && r.scope === 'global');
    const words = 'Call the transmitter engineer on duty; keep clear of the tower base while ice may fall.';
    const base = {
      enabled: true,
      priority: trip.priority,
      params: trip.params,
      onDelayS: trip.onDelayS,
      offDelayS: trip.offDelayS,
      deadband: trip.deadband,
    };
    expect(
      (
        await t
          .request()
          .put(`/api/rules/${trip.id}`)
          .set(t.as('engineer'))
          .send({ ...base, guidance: words })
      ).status,
    ).toBe(200);
    const detail = (await t.request().get(`/api/alarms/${critical}`).set(t.as('technician'))).body.alarm;
    expect(detail.guidance).toBe(words);
    expect(detail.limits).toEqual({ warning: 1.5, trip: 2 });
    // saved again without the field: the words stay; with an empty one: they go
    await t.request().put(`/api/rules/${trip.id}`).set(t.as('engineer')).send(base);
    expect((await t.request().get(`/api/alarms/${critical}`).set(t.as('operator'))).body.alarm.guidance).toBe(words);
    await t
      .request()
      .put(`/api/rules/${trip.id}`)
      .set(t.as('engineer'))
      .send({ ...base, guidance: '' });
    expect((await t.request().get(`/api/alarms/${critical}`).set(t.as('operator'))).body.alarm.guidance).toBeNull();
  });
});
