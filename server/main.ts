import http from 'node:http';
import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { createApp, createServices } from './app';
import type { Config } from './config';

export type Running = { url: string; server: http.Server; stop: () => Promise<void> };

/** Starts the HTTP server (and, as they land, broker, ingest and live hub) on an open db. */
export async function startServer(config: Config, db: Knex, log: Logger): Promise<Running> {
  const services = createServices({ db, config, log });
  const app = createApp({ db, config, log }, services);
  const server = http.createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(config.PORT, config.HOST, () => resolve());
  });
  const addr = server.address();
  const port = typeof addr === 'object' && addr ? addr.port : config.PORT;
  return {
    url: `http://${config.HOST}:${port}`,
    server,
    async stop() {
      server.closeAllConnections();
      await new Promise<void>((r) => server.close(() => r()));
    },
  };
}
