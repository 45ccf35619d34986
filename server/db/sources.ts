import type { Knex } from 'knex';

import * as createPeople from '@/migrations/20261201220000_create_people';
import * as createSites from '@/migrations/20261201220100_create_sites';
import * as createControllers from '@/migrations/20261201230000_create_controllers';
import * as createReadings from '@/migrations/20261201230100_create_readings';
import * as createAlarms from '@/migrations/20261201231000_create_alarms';
import * as createInvites from '@/migrations/20261201232000_create_invites';
import * as createSiteVisits from '@/migrations/20261201233000_create_site_visits';
import * as createSettings from '@/migrations/20261201234000_create_settings';
import * as addReadingReceipt from '@/migrations/20261203010000_add_reading_receipt';
import * as createSystemEvents from '@/migrations/20261203010100_create_system_events';
import * as addSessionKind from '@/migrations/20261203012000_add_session_kind';
import * as manageNetwork from '@/migrations/20261203030000_manage_network';
import * as measuredHeaterPower from '@/migrations/20261203040000_measured_heater_power';
import * as hourlyRollups from '@/migrations/20261203050000_hourly_rollups';
import * as visitExpectedLeave from '@/migrations/20261203060000_visit_expected_leave';
import * as cluster from '@/migrations/20261203070000_cluster';
import * as ruleGuidance from '@/migrations/20261203080000_rule_guidance';
import * as people from '@/seeds/01_people';
import * as sites from '@/seeds/02_sites';
import * as controllers from '@/seeds/03_controllers';
import * as rules from '@/seeds/04_rules';

/**
 * Migrations and seeds imported statically, so the same list runs under tsx and
 * under vitest (knex's folder loader uses a bare import() that neither transforms).
 * Add each new migration and seed here, in order.
 */
const migrations: Record<string, { up: (k: Knex) => Promise<void>; down: (k: Knex) => Promise<void> }> = {
  '20261201220000_create_people.ts': createPeople,
  '20261201220100_create_sites.ts': createSites,
  '20261201230000_create_controllers.ts': createControllers,
  '20261201230100_create_readings.ts': createReadings,
  '20261201231000_create_alarms.ts': createAlarms,
  '20261201232000_create_invites.ts': createInvites,
  '20261201233000_create_site_visits.ts': createSiteVisits,
  '20261201234000_create_settings.ts': createSettings,
  '20261203010000_add_reading_receipt.ts': addReadingReceipt,
  '20261203010100_create_system_events.ts': createSystemEvents,
  '20261203012000_add_session_kind.ts': addSessionKind,
  '20261203030000_manage_network.ts': manageNetwork,
  '20261203040000_measured_heater_power.ts': measuredHeaterPower,
  '20261203050000_hourly_rollups.ts': hourlyRollups,
  '20261203060000_visit_expected_leave.ts': visitExpectedLeave,
  '20261203070000_cluster.ts': cluster,
  '20261203080000_rule_guidance.ts': ruleGuidance,
};

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => Object.keys(migrations),
  getMigrationName: (name) => name,
  getMigration: async (name) => migrations[name],
};

const seeds = [people, sites, controllers, rules];

export async function runSeeds(db: Knex): Promise<void> {
  for (const s of seeds) await s.seed(db);
}
