import { EventEmitter } from 'node:events';
import fs from 'node:fs';
import path from 'node:path';

import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import type { Knex } from 'knex';
import type { Logger } from 'pino';

import { version } from '@/package.json';
import { MariaDbRateStore } from '@/server/db/rate-limit-store';
import type { BrokerAccounts } from '@/server/services/controllers';

import { AlarmEngine } from './alarms/engine';
import { authenticate } from './auth';
import { deviceSecrets, loadDeviceKey } from './broker/device-secret';
import { type Config, mqttPublicUrl } from './config';
import { publicUrl } from './config';
import { AppError, errorHandler } from './errors';
import { asyncApiDocument } from './http/asyncapi';
import { doc } from './http/meta';
import { openApiDocument } from './http/openapi';
import { outbox } from './mail/outbox';
import { originChecker } from './origin';
import { controllersRepository } from './repositories/controllers';
import { auditRepository, peopleRepository, sessionsRepository } from './repositories/people';
import { readingsRepository } from './repositories/readings';
import { sitesRepository } from './repositories/sites';
import { systemEventsRepository } from './repositories/system-events';
import { alarmsRouter } from './routes/alarms';
import { authRouter } from './routes/auth';
import { controllersRouter } from './routes/controllers';
import { devRouter } from './routes/dev';
import { importsRouter } from './routes/imports';
import { peopleRouter } from './routes/people';
import { reportsRouter, visitsRouter } from './routes/reports';
import { rulesRouter } from './routes/rules';
import { settingsRouter } from './routes/settings';
import { sitesRouter } from './routes/sites';
import { crossSiteDefence, securityHeaders } from './security';
import { alarmsService } from './services/alarms';
import { authService } from './services/auth';
import { boardService } from './services/board';
import { commandsService } from './services/commands';
import { controllersService } from './services/controllers';
import { energyService } from './services/energy';
import { hazardService } from './services/hazard';
import { type HealthProbes, healthService } from './services/health';
import { importsService } from './services/imports';
import { teamService } from './services/invites';
import { networkService } from './services/network';
import { peopleService } from './services/people';
import { readingsService } from './services/readings';
import { reportsService } from './services/reports';
import { rulesService } from './services/rules';
import { scopeGuard, siteScope } from './services/scope';
import { settingsService } from './services/settings';
import { visitsService } from './services/visits';

/** Events between the services and the parts that cache or push: each with its arguments. */
export type ServiceEvents = {
  /** a controller's credentials, place or calibration changed: the broker and ingest drop what they cached */
  'controller-changed': [serial: string];
  /** sessions ended or roles changed: the live hub checks its sockets again */
  'sessions-changed': [];
  /** a site, antenna, region or placement changed: open lists fetch again */
  'network-changed': [];
  /** alarm rules changed: engines read them again */
  'rules-changed': [];
};

/**
 * `readDb`: a pool of its own for long reads (history, reports, exports), so that
 * they queue among themselves and never starve ingest or sign-in. `healthDb`: one
 * connection for health alone, so that its answer is the database's, not the wait
 * behind fifty requests' sign-in checks in the main pool.
 */
export type AppDeps = { db: Knex; config: Config; log: Logger; readDb?: Knex; healthDb?: Knex };

/** Builds the services once and wires them into an Express app; no listen() here. */
export function createServices({ db, config, log, readDb = db, healthDb = db }: AppDeps) {
  const people = peopleRepository(db);
  const sessions = sessionsRepository(db);
  const audit = auditRepository(db);
  const sites = sitesRepository(db);
  const controllers = controllersRepository(db);
  const mail = outbox(db, log.child({ module: 'mail' }), {
    host: config.SMTP_HOST,
    port: config.SMTP_PORT,
    from: config.SMTP_FROM,
  });
  const readings = readingsRepository(db);
  const auth = authService({ people, sessions, audit, sessionDays: config.SESSION_DAYS });
  /** what happened, for the parts that keep caches or push to browsers */
  const events = new EventEmitter<ServiceEvents>();
  /**
   * The alarm engine is built here, before the services that use it; `startServer`
   * starts its timers. Its state lives in MariaDB, so acting on an alarm works
   * whether or not this process evaluates readings.
   */
  const engine = new AlarmEngine(db, log.child({ module: 'alarms' }));
  /** hooks that exist only once the server listens (broker port, MQTT publish, the live hub) */
  const scope = siteScope(db);
  const guard = scopeGuard(db, scope);
  const hazard = hazardService(db);
  const sessionsChanged = () => events.emit('sessions-changed');
  const secrets = deviceSecrets(loadDeviceKey(config.DEVICE_KEY, config.DATA_DIR));
  const runtime: {
    probes: HealthProbes | null;
    mqttUrl: string;
    publish: ((topic: string, payload: string) => Promise<void>) | null;
    announce: ((m: { siteId: number; visitId: number; person: string; state: 'on-site' | 'left' }) => void) | null;
    /** an external broker's accounts (mosquitto's dynamic security), set once connected */
    accounts: BrokerAccounts | null;
  } = {
    accounts: null,
    probes: null,
    mqttUrl: mqttPublicUrl(config),
    publish: null,
    announce: null,
  };
  /** a site, antenna, region or controller placement changed: every open list fetches again */
  const networkChanged = () => events.emit('network-changed');
  // long reads (history, reports, energy) on their own pool
  const historyReadings = readingsRepository(readDb);
  const energy = energyService(readDb);
  const controllerService = controllersService({
    db,
    controllers,
    sites,
    audit,
    secrets,
    guard,
    mqttUrl: () => runtime.mqttUrl,
    changed: (serial) => events.emit('controller-changed', serial),
    retire: async (id, personId) => {
      await engine.setOutOfService(id, true, personId);
    },
    moved: networkChanged,
    accounts: () => runtime.accounts,
  });
  return {
    engine,
    repos: { people, sessions, audit, sites, controllers, readings, systemEvents: systemEventsRepository(db) },
    network: networkService({ db, sites, audit, guard, changed: networkChanged }),
    imports: importsService({
      db,
      sites,
      audit,
      changed: networkChanged,
      enrol: (actor, body, trx) => controllerService.enrol(actor, body, trx),
    }),
    events,
    runtime,
    auth,
    people: peopleService({ people, sessions, audit, auth, sessionsChanged }),
    secrets,
    controllers: controllerService,
    readDb,
    readings: readingsService({ readings: historyReadings, controllers, guard, energy }),
    board: boardService(db, controllers),
    scope,
    settings: settingsService({ db, audit }),
    alarms: alarmsService({ db, engine, audit, uploadsDir: config.uploadsDir, guard }),
    rules: rulesService({
      db,
      audit,
      guard,
      changed: async () => {
        await engine.reloadRules();
        events.emit('rules-changed');
      },
    }),
    commands: commandsService({ db, audit, engine, guard, publish: () => runtime.publish }),
    mail,
    team: teamService({ db, audit, mail: () => mail, publicUrl: publicUrl(config), guard, sessionsChanged }),
    reports: reportsService({
      db: readDb,
      readings: historyReadings,
      energy,
      tariffPerKwh: config.TARIFF_PER_KWH,
      currency: config.CURRENCY,
    }),
    energy,
    health: healthService(healthDb, () => runtime.probes),
    hazard,
    visits: visitsService({ db, audit, guard, hazard, announce: (m) => runtime.announce?.(m) }),
  };
}
export type Services = ReturnType<typeof createServices>;

export function createApp(deps: AppDeps, services: Services = createServices(deps)): Express {
  const { config, log } = deps;
  const app = express();
  app.disable('x-powered-by');
  // X-Forwarded-* is believed only from the proxy an operator names (TRUST_PROXY)
  app.set('trust proxy', config.TRUST_PROXY ?? false);
  app.use(securityHeaders(config));

  const api = express.Router();
  api.use(crossSiteDefence(originChecker(config)));
  api.use(express.json({ limit: '256kb' }));
  // part by part; 503 while a part is down, so a load balancer or monitor sees it. Open
  // to all and asked before any session is looked up: a session cookie sent along
  // does not put health behind the sign-in checks of a busy moment
  api.get(
    '/health',
    doc('Health of each part (database, broker, ingest, mail); 503 while a part is down'),
    async (_req, res) => {
      const health = await services.health.check();
      res.status(health.status === 'down' ? 503 : 200).json(health);
    },
  );
  api.use(cookieParser());
  api.use(authenticate(services.auth));
  api.use(
    '/auth',
    authRouter(services.auth, services.team, {
      httpsOnly: (config.PUBLIC_URL ?? '').startsWith('https:'),
      failuresPerAddress: 20,
      failuresPerAccount: 10,
      sessionsChanged: () => services.events.emit('sessions-changed'),
      // several instances count together in MariaDB
      store: config.CLUSTER ? (prefix) => new MariaDbRateStore(deps.db, prefix) : undefined,
    }),
  );
  api.use(
    '/sites',
    sitesRouter({
      sites: services.repos.sites,
      network: services.network,
      board: services.board,
      team: services.team,
      scopeOf: services.scope,
      hazard: services.hazard,
    }),
  );
  api.use('/imports', importsRouter(services.imports));
  api.use('/people', peopleRouter(services.people, services.team));
  api.use(
    '/controllers',
    controllersRouter(
      services.controllers,
      services.readings,
      services.commands,
      services.alarms,
      async () => (await services.settings.get()).operatorsMayCommandHeaters,
    ),
  );
  api.use('/alarms', alarmsRouter(services.alarms, config.uploadsDir));
  api.use('/rules', rulesRouter(services.rules));
  api.use('/reports', reportsRouter(services.reports, services.readDb));
  api.use('/visits', visitsRouter(services.visits));
  api.use('/settings', settingsRouter(services.settings));
  if (config.NODE_ENV !== 'production') api.use('/dev', devRouter(config.mailDir));
  // the contracts for integrators, generated from the mounted routes and the shared schemas
  let openApi: unknown = null;
  api.get('/openapi.json', doc('This document: OpenAPI 3.1 of every route'), (req, res) => {
    openApi ??= openApiDocument(api, { version, serverUrl: '/api' });
    res.json(openApi);
  });
  api.get('/asyncapi.json', doc('AsyncAPI 3 document of the MQTT contract for controllers'), (_req, res) => {
    res.json(
      asyncApiDocument({
        version,
        brokerUrl: services.runtime.mqttUrl,
        websocketUrl: `${publicUrl(config).replace(/^http/, 'ws')}/mqtt`,
      }),
    );
  });
  api.use((_req, _res) => {
    throw new AppError('not_found', 'No such API route');
  });
  api.use(errorHandler(log.child({ module: 'api' })));
  app.use('/api', api);

  // country outlines for the network map, from the bundled atlas: no map service, works offline
  const atlas = path.join(config.root, 'node_modules', 'world-atlas', 'countries-50m.json');
  app.get('/atlas/countries-50m.json', (_req, res) => {
    res.setHeader('Cache-Control', 'public, max-age=604800, immutable');
    res.sendFile(atlas);
  });

  // The web export; every other path falls back to index.html so deep links work.
  const index = path.join(config.webDir, 'index.html');
  app.use(express.static(config.webDir, { index: false, maxAge: '1h' }));
  app.use((req, res, next) => {
    if (req.method !== 'GET' && req.method !== 'HEAD') return next();
    if (!fs.existsSync(index)) {
      res
        .status(503)
        .type('text')
        .send('The web app has not been built yet: run npm start (or npx expo export -p web).');
      return;
    }
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
  return app;
}
