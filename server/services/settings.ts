import type { Knex } from 'knex';

import type { auditRepository } from '@/server/repositories/people';
import { defaultSettings, type Person, type Settings } from '@/telemetry/api';

export function settingsService(deps: { db: Knex; audit: ReturnType<typeof auditRepository> }) {
  return {
    async get(): Promise<Settings> {
      const rows = await deps.db('settings').select('key', 'value');
      const out = { ...defaultSettings } as Record<string, unknown>;
      for (const r of rows) if (r.key in out) out[r.key] = typeof r.value === 'string' ? JSON.parse(r.value) : r.value;
      return out as Settings;
    },
    async set(actor: Person, next: Settings): Promise<Settings> {
      const before = await this.get();
      await deps
        .db('settings')
        .insert(Object.entries(next).map(([key, value]) => ({ key, value: JSON.stringify(value) })))
        .onConflict('key')
        .merge();
      await deps.audit.record({
        personId: actor.id,
        action: 'settings.update',
        subject: 'settings',
        before,
        after: next,
      });
      return this.get();
    },
  };
}
export type SettingsService = ReturnType<typeof settingsService>;
