import { loadConfig } from './config';
import { openDb } from './db/knex';
import { startDemoFleet } from './demo-fleet';
import { createLogger } from './log';
import { startServer } from './main';

/**
 * The server process under `npm start`'s supervisor (server/start.ts), which has
 * already started MariaDB and migrated it. A stray promise rejection is logged and
 * recorded, and the server keeps serving; an uncaught exception leaves the process
 * in an unknown state, so it exits and the supervisor starts a fresh one.
 */
async function serve() {
  const config = loadConfig();
  const log = createLogger(config.LOG_LEVEL);
  const db = openDb(config);
  process.on('unhandledRejection', (err) => {
    log.error({ err }, 'unhandled promise rejection; still serving');
  });
  process.on('uncaughtException', (err) => {
    log.fatal({ err }, 'uncaught exception; exiting for a clean restart');
    process.exit(70);
  });
  const server = await startServer(config, db, log);
  const events = server.services.repos.systemEvents;
  const stopFleet =
    config.SIMULATOR && !config.MQTT_URL
      ? await startDemoFleet(db, {
          root: config.root,
          dataDir: config.DATA_DIR,
          mqttPort: server.broker!.port,
          log: (l) => log.info(l),
        })
      : null;
  await events
    .record('start', `Server started (${process.env.THAWLINE_START_REASON ?? 'started by hand'})`, { pid: process.pid })
    .catch((err) => log.warn({ err: (err as Error).message }, 'start not recorded'));
  let stopping = false;
  const stop = async () => {
    if (stopping) return;
    stopping = true;
    await stopFleet?.();
    await server.stop();
    await db.destroy();
    process.exit(0);
  };
  process.on('SIGTERM', () => void stop());
  process.on('SIGINT', () => void stop());
  // the supervisor is gone (killed): stop rather than run unowned
  process.on('disconnect', () => void stop());
  process.send?.('ready');
}

serve().catch((e) => {
  console.error(`Server start-up failed: ${(e as Error).message}`);
  process.exit(1);
});
