import path from 'node:path';
import { demoPassword, demoPeople } from '../seeds/01_people';
import { loadConfig, publicUrl } from './config';
import { openDb, prepareDb } from './db/knex';
import { startMariadb, type MariadbHandle } from './db/mariadb';
import { createLogger } from './log';
import { startServer } from './main';
import { startDemoFleet } from './demo-fleet';
import { startCatcher } from './mail/catcher';
import { buildWebExport, webExportIsStale } from './web-build';

/** `npm start`: everything on loopback, in order, and stopped in reverse on Ctrl-C. */
async function run() {
  let config;
  try {
    config = loadConfig();
  } catch (e) {
    console.error((e as Error).message);
    process.exit(2);
  }
  const log = createLogger(config.LOG_LEVEL);
  const say = (line: string) => log.info(line);
  const stops: (() => Promise<void>)[] = [];
  let stopping = false;
  const stopAll = async (code: number) => {
    if (stopping) return;
    stopping = true;
    say('Stopping…');
    for (const stop of stops.reverse()) {
      try { await stop(); } catch (e) { log.error({ err: e }, 'stop failed'); }
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
        dataDir: path.join(config.DATA_DIR, 'mariadb'), port: config.DB_PORT, database: config.DB_NAME,
        user: config.DB_USER, password: config.DB_PASSWORD, log: say,
      });
      stops.push(() => mariadb!.stop());
    }
    const db = openDb(config);
    stops.push(() => db.destroy());
    const { seeded } = await prepareDb(db, { seedWhenEmpty: true });
    if (seeded) say('Demo scenario seeded');
    if (config.SMTP_CATCHER) {
      const catcher = await startCatcher({ port: config.SMTP_PORT, dir: path.join(config.DATA_DIR, 'mail') });
      stops.push(() => catcher.close());
      say(`SMTP catcher on 127.0.0.1:${catcher.port}; e-mails land in ${path.join(config.DATA_DIR, 'mail')}`);
    }
    if (webExportIsStale(config.root)) await buildWebExport(config.root, say);
    const server = await startServer({ ...config }, db, log);
    stops.push(() => server.stop());
    if (config.SIMULATOR && !config.MQTT_URL) {
      stops.push(await startDemoFleet(db, { root: config.root, dataDir: config.DATA_DIR, mqttPort: server.broker!.port, log: say }));
    }
    const url = publicUrl(config);
    console.log(`\nThawline is running at ${url}  (ready in ${((Date.now() - started) / 1000).toFixed(1)} s)\n`);
    console.log(`Demo sign-ins (password "${demoPassword}"):`);
    for (const p of demoPeople) console.log(`  ${p.role.padEnd(11)} ${p.email}`);
    console.log('\nCtrl-C stops everything.\n');
  } catch (e) {
    console.error(`Start-up failed: ${(e as Error).message}`);
    await stopAll(1);
  }
}

void run();
