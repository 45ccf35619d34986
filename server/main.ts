import crypto from 'node:crypto';
import http from 'node:http';
import type { Duplex } from 'node:stream';

import type { Knex } from 'knex';
import type { Logger } from 'pino';
import { createWebSocketStream, WebSocketServer } from 'ws';

import type { LiveMessage } from '@/telemetry/live';

import { type AlarmChange, AlarmEngine } from './alarms/engine';
import { type AlarmNotifier, alarmNotifier } from './alarms/notify';
import { createApp, createServices, type Services } from './app';
import { type Broker, startBroker } from './broker/broker';
import { controllerDirectory } from './broker/directory';
import { type DynsecAdmin, dynsecAdmin } from './broker/dynsec';
import { maxMqttPacketBytes } from './broker/packet-limit';
import { type BusEvent, busTopic, type ClusterBus, clusterBus } from './cluster/bus';
import { type Job, Membership } from './cluster/membership';
import type { Config } from './config';
import { publicUrl } from './config';
import { openDb } from './db/knex';
import { type AcceptedReading, Ingest, type IngestOptions, toLiveReading } from './ingest/ingest';
import { inProcessSource, type MessageSource, mqttSource } from './ingest/source';
import { type LiveHub, startLiveHub } from './live/hub';
import { originChecker } from './origin';
import { makeGuard, pathOf } from './runtime/guard';

export type Running = {
  url: string;
  server: http.Server;
  services: Services;
  broker: Broker | null;
  ingest: Ingest;
  live: LiveHub;
  engine: AlarmEngine;
  /** among several instances (CLUSTER=1): this one's leases; null when alone */
  membership: Membership | null;
  notifier: AlarmNotifier;
  stop: () => Promise<void>;
};

export type StartOptions = { ingest?: IngestOptions; ingestVia?: 'in-process' | 'mqtt'; mailEveryMs?: number };

/** Starts broker (unless MQTT_URL), ingest, live hub and HTTP server on an open db. */
export async function startServer(config: Config, db: Knex, log: Logger, opts: StartOptions = {}): Promise<Running> {
  const guard = makeGuard(log.child({ module: 'guard' }));
  // long reads get 4 connections of their own; ingest and sign-in keep the main pool
  const readDb = openDb(config, config.DB_NAME, 4);
  // and health its own connection: it answers for the database, not for the queue in the main pool
  const healthDb = openDb(config, config.DB_NAME, 1);
  const services = createServices({ db, config, log, readDb, healthDb });
  const app = createApp({ db, config, log, readDb, healthDb }, services);
  // several instances: leases on controllers and jobs, and a bus on the shared broker
  const membership = config.CLUSTER
    ? new Membership(db, log.child({ module: 'cluster' }), config.INSTANCE_ID, { url: publicUrl(config) })
    : null;
  let source!: MessageSource;
  const bus = membership ? clusterBus(membership.id, (topic, payload) => source.publish(topic, payload)) : null;
  const made = await messageSource(config, services, log, opts, bus);
  source = made.source;
  const { broker, directory, accounts } = made;
  const ingest = new Ingest(
    source,
    services.repos.controllers,
    services.repos.readings,
    log.child({ module: 'ingest' }),
    membership ? { ...opts.ingest, owns: (id) => membership.owns(id) } : opts.ingest,
  );
  /** what every browser must hear, on this instance and (through the bus) on the others */
  const announce = (message: LiveMessage) => {
    live.publish(message);
    bus?.send({ kind: 'live', message });
  };
  const forgetController = (serial: string) => {
    directory.forget(serial);
    ingest.invalidate(serial);
    broker?.disconnect(serial);
  };
  services.events.on(
    'controller-changed',
    guard('controller change', (serial: string) => {
      forgetController(serial);
      bus?.send({ kind: 'controller-changed', serial });
    }),
  );

  const server = http.createServer(app);
  const sameOrigin = originChecker(config);
  const live = startLiveHub(services.auth, log.child({ module: 'live' }), services.scope, {
    allowedOrigin: sameOrigin,
  });
  services.events.on(
    'sessions-changed',
    guard('live recheck', () => {
      bus?.send({ kind: 'sessions' });
      return live.recheck();
    }),
  );
  services.events.on(
    'network-changed',
    guard('network change', () => announce({ type: 'network' })),
  );
  services.events.on('rules-changed', () => bus?.send({ kind: 'rules' }));
  const mqttWs = dispatchUpgrades(server, { live, broker, sameOrigin, guard });
  ingest.on(
    'reading',
    guard('live push', (r: AcceptedReading) => live.reading(toLiveReading(r))),
  );
  // readings of controllers another instance owns: for this instance's browsers
  ingest.on(
    'observed',
    guard('live push', (r: AcceptedReading) => live.reading(toLiveReading(r))),
  );
  ingest.on('status', (s: { controllerId: number; siteId: number; online: boolean }) =>
    live.publish({
      type: 'controller',
      controllerId: s.controllerId,
      siteId: s.siteId,
      status: s.online ? 'online' : 'silent',
    }),
  );
  const engine = services.engine;
  services.runtime.publish = (topic, payload) => source.publish(topic, payload);
  services.runtime.announce = (m) => announce({ type: 'visit', ...m });
  const mail = services.mail;
  const notifier = alarmNotifier(db, mail, log.child({ module: 'notify' }), publicUrl(config));
  engine.on(
    'change',
    guard('alarm notification', (c: AlarmChange) => {
      announce({ type: 'alarm', alarmId: c.alarmId, siteId: c.siteId, state: c.state });
      return notifier.onChange(c);
    }),
  );
  engine.on('acted', (source) => bus?.send({ kind: 'alarm-source', source }));
  ingest.on(
    'reading',
    guard('alarm evaluation', (r: AcceptedReading) => engine.onReading(r)),
  );
  ingest.on(
    'command-result',
    guard('command result', (r: { controllerId: number; id: string; ok: boolean; message: string }) =>
      // every instance hears it; the owner records it
      !membership || membership.owns(r.controllerId) ? services.commands.recordResult(r) : undefined,
    ),
  );
  services.events.on(
    'controller-changed',
    guard('controller reload', async (serial: string) => {
      const c = await services.repos.controllers.bySerial(serial);
      if (c) await engine.reloadController(c.id);
    }),
  );
  services.runtime.probes = {
    broker: () =>
      broker
        ? { ok: !broker.aedes.closed, message: `embedded broker: ${broker.aedes.connectedClients} connections` }
        : {
            ok: source.connected(),
            message: source.connected() ? `connected to ${source.name}` : `not connected to ${source.name}`,
          },
    ingest: () => ({
      buffered: ingest.buffered,
      dbDownSince: ingest.dbDownSince,
      droppedOverflow: ingest.stats.droppedOverflow,
      lastAcceptedAt: ingest.lastAcceptedAt,
      maxBuffered: ingest.maxBuffered,
    }),
    engineRunning: () => engineRunning,
  };
  // health to /live every few seconds (sent on when its state changes), and at once when the database comes or goes
  const pushHealth = guard('health', async () => live.system(await services.health.check()));
  const healthTimer = setInterval(pushHealth, 5000);
  ingest.on(
    'db',
    guard('database outage record', async (e: { up: boolean; since: Date }) => {
      pushHealth();
      if (!e.up) return;
      // recorded once, when the database is back: an outage is one system event, not an alarm per controller
      const s = Math.round((Date.now() - e.since.getTime()) / 1000);
      await services.repos.systemEvents.record(
        'database-outage',
        `Database unreachable for ${s} s; readings were held and written when it returned`,
        {
          since: e.since.toISOString(),
          seconds: s,
          dbFailures: ingest.stats.dbFailures,
          droppedOverflow: ingest.stats.droppedOverflow,
        },
      );
    }),
  );
  let engineRunning = false;
  await engine.start();
  engineRunning = true;
  if (membership && bus) {
    engine.cluster = {
      owns: (id) => membership.owns(id),
      fence: (trx, id) => membership.checkFence(trx, id),
    };
    membership.on('gained', (ids) => {
      ingest.ownershipChanged();
      void engine.adopt([...ids.keys()]).catch((err) => log.warn({ err }, 'taking over alarm state failed'));
      log.info({ gained: ids.size, owned: membership.ownedIds().length }, 'controllers taken over');
    });
    membership.on('lost', (ids) => {
      ingest.ownershipChanged(ids);
      log.info({ lost: ids.length, owned: membership.ownedIds().length }, 'controllers handed over');
    });
    bus.on(
      guard('cluster event', (e: BusEvent) => {
        if (e.kind === 'live') live.publish(e.message);
        if (e.kind === 'alarm-source') return engine.reloadSource(e.source);
        if (e.kind === 'controller-changed') {
          forgetController(e.serial);
          return services.repos.controllers.bySerial(e.serial).then((c) => c && engine.reloadController(c.id));
        }
        if (e.kind === 'sessions') return live.recheck();
        if (e.kind === 'rules') return engine.reloadRules();
      }),
    );
    await membership.start();
  }
  // one instance at a time sends mail, escalates and deletes old readings
  const runs = (job: Job) => !membership || membership.holdsJob(job);
  mail.start(opts.mailEveryMs ?? 2000, () => runs('mail'));
  const escalation = setInterval(
    guard('escalation pass', () => (runs('escalation') ? notifier.escalate() : undefined)),
    30_000,
  );
  await ingest.start();

  // raw-data retention, hourly
  const retention = setInterval(() => {
    if (!runs('retention')) return;
    const cutoff = new Date(Date.now() - config.RAW_RETENTION_DAYS * 86_400_000);
    services.repos.readings.deleteOlderThan(cutoff).then(
      (n) => n && log.info({ deleted: n }, 'raw readings past retention deleted'),
      (err) => log.warn({ err: (err as Error).message }, 'retention pass failed'),
    );
  }, 3_600_000);

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(config.PORT, config.HOST, () => resolve());
  });
  const addr = server.address();
  const port = typeof addr === 'object' && addr ? addr.port : config.PORT;
  return {
    url: `http://${config.HOST}:${port}`,
    server,
    services,
    broker,
    ingest,
    live,
    engine,
    notifier,
    membership,
    async stop() {
      clearInterval(retention);
      clearInterval(healthTimer);
      engineRunning = false;
      clearInterval(escalation);
      // browsers hear "going away" and reconnect (to another instance behind the same address)
      live.disconnectAll();
      live.close();
      for (const c of mqttWs.clients) c.terminate();
      mqttWs.close();
      await ingest.close();
      await engine.stop();
      // the last writes are in: hand every lease back so the others take over at once
      await membership?.stop();
      mail.stop();
      await broker?.close();
      await accounts?.close();
      server.closeAllConnections();
      await new Promise<void>((r) => server.close(() => r()));
      await readDb.destroy();
      await healthDb.destroy();
    },
  };
}

/**
 * Where controllers' messages come from: Debian's mosquitto or another broker
 * (MQTT_URL), or the embedded aedes broker with its directory of controllers.
 */
async function messageSource(
  config: Config,
  services: Services,
  log: Logger,
  opts: StartOptions,
  bus: ClusterBus | null,
) {
  const directory = controllerDirectory(
    async (serial) => {
      const row = await services.repos.controllers.bySerial(serial);
      return row ? { id: row.id, passwordHash: row.password_hash, decommissioned: Boolean(row.decommissioned) } : null;
    },
    services.secrets,
    async (id, hash) => {
      await services.repos.controllers.update(id, { password_hash: hash });
    },
  );

  let broker: Broker | null = null;
  let source: MessageSource;
  let accounts: DynsecAdmin | null = null;
  if (config.MQTT_URL) {
    if (config.MQTT_DYNSEC) {
      // mosquitto keeps the accounts: Thawline's own is made or brought up to date first
      const admin = await dynsecAdmin(config.MQTT_URL, config.MQTT_ADMIN_USERNAME!, config.MQTT_ADMIN_PASSWORD!);
      await admin.ensureServerAccount(config.MQTT_USERNAME!, config.MQTT_PASSWORD!);
      services.runtime.accounts = admin;
      accounts = admin;
    }
    source = mqttSource(
      config.MQTT_URL,
      config.MQTT_USERNAME ?? 'thawline-ingest',
      config.MQTT_PASSWORD ?? '',
      bus ? { topics: [busTopic], onMessage: (_topic, payload) => bus.receive(payload) } : undefined,
    );
  } else {
    const ingestCreds = { username: 'thawline-ingest', password: crypto.randomBytes(24).toString('base64url') };
    broker = await startBroker({
      host: config.HOST,
      port: config.MQTT_PORT,
      directory,
      ingest: ingestCreds,
      log: log.child({ module: 'broker' }),
    });
    if (!config.MQTT_URL) services.runtime.mqttUrl = `mqtt://${config.HOST}:${broker.port}`;
    source =
      opts.ingestVia === 'mqtt'
        ? mqttSource(`mqtt://127.0.0.1:${broker.port}`, ingestCreds.username, ingestCreds.password)
        : inProcessSource(broker.aedes);
  }
  return { broker, source, directory, accounts };
}

/** One dispatcher for every upgrade request: /live and /mqtt; a bad request line or cookie is refused, never thrown. */
function dispatchUpgrades(
  server: http.Server,
  d: {
    live: ReturnType<typeof startLiveHub>;
    broker: Broker | null;
    sameOrigin: ReturnType<typeof originChecker>;
    guard: ReturnType<typeof makeGuard>;
  },
) {
  const { live, broker, sameOrigin, guard } = d;
  // MQTT over WebSocket on /mqtt for browser tools; the same credentials, ACL and packet limit apply
  const mqttWs = new WebSocketServer({ noServer: true, maxPayload: maxMqttPacketBytes });
  // one dispatcher for every upgrade request: a bad request line or cookie is refused, never thrown
  server.on(
    'upgrade',
    guard('upgrade', async (req: http.IncomingMessage, socket: Duplex, head: Buffer) => {
      socket.on('error', () => socket.destroy());
      const p = pathOf(req.url);
      if (p === '/live') return live.upgrade(req, socket, head);
      if (p === '/mqtt' && broker) {
        if (!sameOrigin(req.headers.origin, req.headers.host))
          return socket.end('HTTP/1.1 403 Forbidden\r\nConnection: close\r\n\r\n');
        return mqttWs.handleUpgrade(req, socket, head, (ws) => broker!.handle(createWebSocketStream(ws), req));
      }
      socket.end(`HTTP/1.1 ${p === null ? '400 Bad Request' : '404 Not Found'}\r\nConnection: close\r\n\r\n`);
    }),
  );
  return mqttWs;
}
