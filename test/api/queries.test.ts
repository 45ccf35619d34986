import { afterAll, beforeAll, describe, expect, it } from 'vitest';

import { testApp } from '@/test/helpers/app';

let t: Awaited<ReturnType<typeof testApp>>;
const n = 200;

beforeAll(async () => {
  t = await testApp();
  const site = await t.db('sites').where({ code: 'SBF' }).first();
  const antenna = await t.db('antennas').where({ site_id: site.id }).first();
  const ids: number[] = [];
  for (let i = 0; i < n; i++) {
    const [id] = await t.db('controllers').insert({
      serial: `QC-${i}`,
      site_id: site.id,
      antenna_id: antenna.id,
      kind: 'heater',
      interval_s: 10,
      password_hash: 'x',
    });
    await t
      .db('controller_placements')
      .insert({ controller_id: id, site_id: site.id, antenna_id: antenna.id, from_at: null });
    ids.push(id);
  }
  const now = Date.now();
  const rows = ids.flatMap((id) =>
    [0, 1, 2].map((k) => ({
      controller_id: id,
      boot: 'q',
      seq: k,
      ts: new Date(now - (3 - k) * 10_000),
      air_temp_c: -2,
      forward_w: 1000,
      reflected_w: 20,
      vswr: 1.33,
      heater_mode: 'auto',
      heater_on: 1,
      heater_current_a: 40,
      supply_volts: 240,
    })),
  );
  for (let i = 0; i < rows.length; i += 300) await t.db('readings').insert(rows.slice(i, i + 300));
});
afterAll(async () => {
  await t?.close();
});

/** Statements the database receives while one request is answered. */
async function queriesFor(run: () => Promise<{ status: number }>) {
  let count = 0;
  const onQuery = () => {
    count++;
  };
  t.db.on('query', onQuery);
  try {
    const res = await run();
    expect(res.status).toBe(200);
  } finally {
    t.db.off('query', onQuery);
  }
  return count;
}

describe(`no query per controller: ${n} controllers at one site`, () => {
  it('the Board snapshot', async () => {
    const count = await queriesFor(() => t.request().get('/api/sites/board').set(t.as('operator')));
    expect(count).toBeLessThanOrEqual(8);
  });

  it('the storm report', async () => {
    const site = await t.db('sites').where({ code: 'SBF' }).first();
    const to = new Date(Date.now() + 60_000).toISOString();
    const from = new Date(Date.now() - 3_600_000).toISOString();
    const count = await queriesFor(() =>
      t.request().get('/api/reports/storm').query({ site: site.id, from, to }).set(t.as('engineer')),
    );
    expect(count).toBeLessThanOrEqual(14);
  });

  it('the Energy report, over a short window (samples) and a long one (rollups)', async () => {
    const to = new Date(Date.now() + 60_000);
    for (const days of [1, 30]) {
      const from = new Date(to.getTime() - days * 86_400_000);
      const count = await queriesFor(() =>
        t
          .request()
          .get('/api/reports/energy')
          .query({ from: from.toISOString(), to: to.toISOString() })
          .set(t.as('engineer')),
      );
      expect(count, `${days} days`).toBeLessThanOrEqual(10);
    }
  });
});
