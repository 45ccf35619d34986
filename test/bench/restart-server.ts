/** The server process of `npm run bench:restart`: config from the environment, killed and started again by the bench. */
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
