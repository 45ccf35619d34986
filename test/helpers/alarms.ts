import type { Knex } from 'knex';

import { type AlarmMachine, idleMachine, type Priority } from '@/telemetry/alarms/machine';

/**
 * A storm's flood of open alarms, written straight into MariaDB: `n` alarms over the
 * controllers of `siteIds`, one a minute, high, medium and low in turn, and the last
 * (the newest, so age alone would list it last) a critical VSWR trip.
 * Returns the ids in the order raised and the critical one's id.
 */
export async function insertAlarmFlood(db: Knex, siteIds: number[], n = 30) {
  const active: AlarmMachine = { ...idleMachine, active: true, acked: false, value: 1.6 };
  const controllers = await db('controllers').whereIn('site_id', siteIds).select('id', 'site_id');
  const t0 = Date.now() - 3_600_000;
  const ids: number[] = [];
  let critical = 0;
  for (let i = 0; i < n; i++) {
    const c = controllers[i % controllers.length];
    const last = i === n - 1;
    const priority: Priority = last ? 'critical' : (['high', 'medium', 'low'] as const)[i % 3];
    const [id] = await db('alarms').insert({
      source: `flood-${i}:${c.id}`,
      open_source: `flood-${i}:${c.id}`,
      kind: last ? 'vswr-trip' : 'vswr-warning',
      controller_id: c.id,
      site_id: c.site_id,
      priority,
      state: 'unacknowledged',
      message: last ? 'VSWR 3.10:1 at the antenna (trip 2.5:1)' : `VSWR 1.6${i % 10}:1 at the antenna (limit 1.5:1)`,
      machine: JSON.stringify(active),
      raised_at: new Date(t0 + i * 60_000),
    });
    ids.push(id);
    if (last) critical = id;
  }
  return { ids, critical };
}
