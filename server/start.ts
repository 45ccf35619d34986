import { type ChildProcess, fork } from 'node:child_process';
import path from 'node:path';

import { demoPassword, demoPeople } from '@/seeds/01_people';
import { roleLabels } from '@/telemetry/roles';

import { bundleServer, serverNodeArgs } from './bundle';
import { type Config, loadConfig, publicUrl } from './config';
import { openDb, prepareDb } from './db/knex';
import { type MariadbHandle, startMariadb } from './db/mariadb';
import { createLogger } from './log';
import { startCatcher } from './mail/catcher';
import { systemEventsRepository } from './repositories/system-events';
import { buildWebExport, webExportIsStale } from './web-build';

/**
 * `npm start`: a supervisor that owns every part. It starts (or adopts) MariaDB,
 * the SMTP catcher and the web build, then runs the server in a child process and
 * starts it again when it dies, recording each crash once as a system event. Ctrl-C
 * stops everything in reverse order; if this process is killed, the server child
 * sees its channel close and stops, and the next start adopts MariaDB.
 */
async function run() {
  let config: Config;
  try {
    config = loadConfig();
  } catch (e) {
    console.error((e as Error).message);
    process.exit(2);
  }
  const log = createLogger(config.LOG_LEVEL).child({ module: 'supervisor' });
  const say = (line: string) => log.info(line);
  const stops: (() => Promise<void>)[] = [];
  let stopping = false;
  let child: ChildProcess | null = null;
  const stopAll = async (code: number) => {
    if (stopping) return;
    stopping = true;
    say('Stopping…');
    if (child && child.exitCode == null && child.signalCode == null) {
      const gone = new Promise((r) => child!.once('exit', r));
      child.kill('SIGTERM');
      await gone;
    }
    for (const stop of stops.reverse()) {
      try {
        await stop();
      } catch (e) {
        log.error({ err: e }, 'stop failed');
      }
    }
    process.exit(code);
  };
  process.on('SIGINT', () => void stopAll(0));
  process.on('SIGTERM', () => void stopAll(0));

  try {
    const started = Date.now();
    let mariadb: MariadbHandle | null = null;
    if (config.DB_MANAGED) {
      mariadb = await startMariadb({
        dataDir: path.join(config.DATA_DIR, 'mariadb'),
        port: config.DB_PORT,
        database: config.DB_NAME,
        user: config.DB_USER,
        password: config.DB_PASSWORD,
        log: say,
      });
      stops.push(() => mariadb!.stop());
    }
    const db = openDb(config);
    stops.push(() => db.destroy());
    const { seeded } = await prepareDb(db, { seedWhenEmpty: true });
    if (seeded) say('Demo scenario seeded');
    const events = systemEventsRepository(db);
    if (config.SMTP_CATCHER) {
      const catcher = await startCatcher({ port: config.SMTP_PORT, dir: config.mailDir });
      stops.push(() => catcher.close());
      say(`SMTP catcher on 127.0.0.1:${catcher.port}; e-mails land in ${config.mailDir} and on the Outbox page`);
    }
    if (webExportIsStale(config.root)) await buildWebExport(config.root, say);

    // the server runs as one bundle under plain node (server/bundle.ts), rebuilt at every start
    const serverFile = await bundleServer(config.root);

    let restarts = 0;
    let lastStart = 0;
    const launch = (reason: string) =>
      new Promise<void>((resolve, reject) => {
        lastStart = Date.now();
        child = fork(serverFile, [], {
          execArgv: serverNodeArgs,
          env: { ...process.env, THAWLINE_START_REASON: reason },
          stdio: 'inherit',
        });
        child.once('message', (m) => (m === 'ready' ? resolve() : undefined));
        child.once('exit', (code, signal) => {
          if (stopping) return;
          const what = signal ? `signal ${signal}` : `exit code ${code}`;
          reject(new Error(`the server process stopped during start-up (${what})`));
          if (Date.now() - lastStart > 60_000) restarts = 0;
          const waitMs = Math.min(30_000, 1000 * 2 ** restarts++);
          log.error({ code, signal, restartInMs: waitMs }, 'server process died; starting it again');
          events
            .record('crash-restart', `The server process stopped unexpectedly (${what}); restarted by the supervisor`, {
              code,
              signal,
            })
            .catch((err) => log.warn({ err: (err as Error).message }, 'crash not recorded'));
          setTimeout(() => {
            if (!stopping) void launch(`restart after ${what}`).catch(() => {});
          }, waitMs);
        });
      });
    await launch('npm start');
    const url = publicUrl(config);
    console.log(`\nThawline is running at ${url}  (ready in ${((Date.now() - started) / 1000).toFixed(1)} s)\n`);
    console.log(`Demo sign-ins (password "${demoPassword}"):`);
    for (const p of demoPeople) console.log(`  ${roleLabels[p.role].padEnd(24)} ${p.email}`);
    console.log('\nCtrl-C stops everything.\n');
  } catch (e) {
    console.error(`Start-up failed: ${(e as Error).message}`);
    await stopAll(1);
  }
}

void run();
