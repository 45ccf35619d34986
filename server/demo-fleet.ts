import { type ChildProcess, spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

import type { Knex } from 'knex';

import { demoControllerPassword } from '@/seeds/03_controllers';

/** Starts the simulator for the demo controllers (development only). */
export async function startDemoFleet(
  db: Knex,
  opts: { root: string; dataDir: string; mqttPort?: number; mqttUrl?: string; log: (l: string) => void },
): Promise<() => Promise<void>> {
  const rows = await db('controllers as c')
    .join('sites as s', 's.id', 'c.site_id')
    .leftJoin('antennas as a', 'a.id', 'c.antenna_id')
    .where('c.decommissioned', false)
    .whereRaw("c.serial REGEXP '^[A-Z]{3}-[0-9]+$'")
    .select('c.serial', 'c.kind', 'a.heater_kw', 'a.service', 's.power_source', 's.battery_kwh');
  const fleet = rows.map((r, i) => ({
    serial: r.serial,
    password: demoControllerPassword,
    kind: r.kind,
    seed: i + 1,
    heaterKw: r.heater_kw ?? (r.kind === 'gas-heater' ? 0 : 1),
    forwardW: r.service === 'fm' ? 10_000 : r.service === 'tv' ? 20_000 : 10,
    offGrid: r.power_source === 'utility' ? null : { batteryKwh: r.battery_kwh ?? 20 },
    // the demo storm's trouble: one failed heater element
    faultyHeater: r.serial === 'CVB-1',
  }));
  const file = path.join(opts.dataDir, 'demo-fleet.json');
  fs.writeFileSync(file, JSON.stringify(fleet));
  // stdin is a pipe the simulator watches: when this process dies, however, the simulator stops too
  const child: ChildProcess = spawn(
    process.execPath,
    [
      '--import',
      'tsx',
      path.join(opts.root, 'simulator/main.ts'),
      '--fleet',
      file,
      '--url',
      opts.mqttUrl ?? `mqtt://127.0.0.1:${opts.mqttPort}`,
      '--exit-with-parent',
    ],
    { stdio: ['pipe', 'ignore', 'inherit'], cwd: opts.root },
  );
  opts.log(`Simulator started for ${fleet.length} demo controllers`);
  return async () => {
    if (child.exitCode != null) return;
    const done = new Promise((r) => child.once('exit', r));
    child.kill('SIGTERM');
    await done;
  };
}
