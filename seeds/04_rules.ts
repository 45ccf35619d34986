import type { Knex } from 'knex';

import { defaultRules } from '@/telemetry/alarms/rules';

/** Global default rules (site practice, meant to be tuned per site). */
export async function seed(knex: Knex): Promise<void> {
  for (const r of defaultRules) {
    const found = await knex('alarm_rules').where({ kind: r.kind, scope: 'global' }).first();
    if (found) continue;
    await knex('alarm_rules').insert({
      kind: r.kind,
      scope: r.scope,
      scope_id: null,
      enabled: r.enabled,
      priority: r.priority,
      params: JSON.stringify(r.params),
      on_delay_s: r.onDelayS,
      off_delay_s: r.offDelayS,
      deadband: r.deadband,
    });
  }
}
