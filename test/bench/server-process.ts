/** A benchmark's server in a process of its own (config from the environment), so the bench's clients do not share its event loop. */
import pino from 'pino';

import { loadConfig } from '@/server/config';
import { openDb } from '@/server/db/knex';
import { startServer } from '@/server/main';

const config = loadConfig();
startServer(config, openDb(config), pino({ level: 'warn' })).then(
  () => process.send?.('ready'),
  (e) => {
    console.error(`bench server failed to start: ${(e as Error).message}`);
    process.exit(1);
  },
);
