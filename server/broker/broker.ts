import crypto from 'node:crypto';
import type http from 'node:http';
import net from 'node:net';
import type { Duplex } from 'node:stream';

import { Aedes, type Client } from 'aedes';
import type { Logger } from 'pino';

import { parseTopic, topicRoot } from '@/telemetry/wire';

import type { ControllerDirectory } from './directory';
import { handleWithLimit } from './packet-limit';

/**
 * The embedded MQTT 3.1.1 broker. Each controller signs in with its serial and
 * password and may publish only under its own topics and subscribe only to its
 * own command topic; the server's ingest client has credentials of its own.
 */
export type BrokerOptions = {
  host: string;
  port: number;
  directory: ControllerDirectory;
  ingest: { username: string; password: string };
  log: Logger;
  /** messages per second a controller may publish before it is cut off */
  perClientRate?: number;
};

type Tagged = Client & { thawline?: { role: 'ingest' } | { role: 'controller'; serial: string; controllerId: number } };

export type Broker = {
  aedes: Aedes;
  port: number;
  /** takes a connection (TCP or WebSocket stream) with the packet size limit */
  handle: (conn: Duplex, req?: http.IncomingMessage) => void;
  /** drop a controller's connection at once (after decommissioning or a new password) */
  disconnect: (serial: string) => void;
  close: () => Promise<void>;
};

export async function startBroker(opts: BrokerOptions): Promise<Broker> {
  // concurrency 0: deliveries are not queued behind a slow subscriber (see shared/performance.md)
  const aedes = await Aedes.createBroker({ concurrency: 0, heartbeatInterval: 60_000, drainTimeout: 10_000 } as never);
  const log = opts.log;
  const bySerial = new Map<string, Tagged>();
  aedes.authenticate = signIn(opts, bySerial);
  aedes.authorizePublish = publishGuard(log, opts.perClientRate ?? 2000);
  aedes.authorizeSubscribe = subscribeGuard(log);

  aedes.on('clientDisconnect', (client: Tagged) => {
    const who = client.thawline;
    if (who?.role === 'controller' && bySerial.get(who.serial) === client) bySerial.delete(who.serial);
  });
  aedes.on('clientError', (client: Tagged, err) => log.debug({ err: err.message, id: client.id }, 'mqtt client error'));

  const server = net.createServer({ noDelay: true }, (socket) => {
    socket.on('error', () => socket.destroy());
    handleWithLimit(aedes, socket);
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, opts.host, () => resolve());
  });
  const port = (server.address() as net.AddressInfo).port;
  log.info({ port }, 'MQTT broker listening');
  return {
    aedes,
    port,
    handle: (conn, req) => void handleWithLimit(aedes, conn, req),
    disconnect(serial) {
      bySerial.get(serial)?.close();
      bySerial.delete(serial);
    },
    async close() {
      for (const c of bySerial.values()) c.close();
      await new Promise<void>((r) => server.close(() => r()));
      await new Promise<void>((r) => aedes.close(() => r()));
    },
  };
}

/**
 * Failed controller sign-ins, per address and per serial: after so many failures
 * in `windowMs` further attempts are refused without a password check until the
 * window passes, so guessing costs the broker nothing and a storm of bad devices
 * cannot starve good ones.
 */
export function signInThrottle(serialLimit = 10, addressLimit = 60, windowMs = 60_000) {
  const counts = new Map<string, { n: number; until: number }>();
  const over = (key: string, limit: number, now: number) => {
    const c = counts.get(key);
    if (c && c.until < now) counts.delete(key);
    return (counts.get(key)?.n ?? 0) >= limit;
  };
  const bump = (key: string, now: number) => {
    const c = counts.get(key);
    if (c && c.until >= now) c.n++;
    else counts.set(key, { n: 1, until: now + windowMs });
    if (counts.size > 100_000) counts.clear();
  };
  return {
    blocked: (address: string, serial: string, now = Date.now()) =>
      over(`a:${address}`, addressLimit, now) || over(`s:${serial}`, serialLimit, now),
    fail(address: string, serial: string, now = Date.now()) {
      bump(`a:${address}`, now);
      bump(`s:${serial}`, now);
    },
  };
}

const refused = (why: string, code = 4) => Object.assign(new Error(why), { returnCode: code }) as never;

/** Sign-in: the ingest client by its one-off secret, controllers by serial and password (throttled when they fail). */
function signIn(opts: BrokerOptions, bySerial: Map<string, Tagged>) {
  const log = opts.log;
  const failures = signInThrottle();
  const authenticate: Aedes['authenticate'] = (client: Tagged, username, password, done) => {
    const pw = password?.toString('utf8') ?? '';
    const address = (client.conn as { remoteAddress?: string }).remoteAddress ?? '?';
    if (username === opts.ingest.username) {
      if (
        pw.length === opts.ingest.password.length &&
        crypto.timingSafeEqual(Buffer.from(pw), Buffer.from(opts.ingest.password))
      ) {
        client.thawline = { role: 'ingest' };
        return done(null, true);
      }
      return done(refused('bad credentials'), false);
    }
    // serials are canonical (upper case): a case variant is another, unknown name
    if (!username || username !== username.toUpperCase()) return done(refused('bad credentials'), false);
    if (failures.blocked(address, username)) return done(refused('too many failed sign-ins', 5), false);
    opts.directory.verify(username, pw).then(
      (found) => {
        if (!found) {
          failures.fail(address, username);
          return done(refused('bad credentials'), false);
        }
        client.thawline = { role: 'controller', serial: username, controllerId: found.id };
        bySerial.get(username)?.close();
        bySerial.set(username, client);
        done(null, true);
      },
      (err) => {
        log.error({ err }, 'credential check failed');
        done(Object.assign(new Error('server unavailable'), { returnCode: 3 }) as never, false);
      },
    );
  };
  return authenticate;
}

/** Publishing: ingest sends commands only; a controller its own topics, at most `rate` messages a second. */
function publishGuard(log: Logger, rate: number) {
  const buckets = new WeakMap<Client, { tokens: number; at: number }>();
  const authorizePublish: Aedes['authorizePublish'] = (client: Tagged | null, packet, done) => {
    const who = client?.thawline;
    if (!who) return done(new Error('not signed in'));
    if (who.role === 'ingest') {
      return parseTopic(packet.topic)?.channel === 'command'
        ? done(null)
        : done(new Error('ingest publishes commands only'));
    }
    const t = parseTopic(packet.topic);
    if (!t || t.serial !== who.serial || t.channel === 'command') {
      log.warn({ serial: who.serial, topic: packet.topic }, 'publish outside own topics refused');
      return done(new Error('topic not allowed'));
    }
    const now = Date.now();
    const b = buckets.get(client!) ?? { tokens: rate * 2, at: now };
    b.tokens = Math.min(rate * 2, b.tokens + ((now - b.at) / 1000) * rate);
    b.at = now;
    if (b.tokens < 1) {
      log.warn({ serial: who.serial }, 'publish rate over the per-controller limit: disconnecting');
      return done(new Error('rate limit'));
    }
    b.tokens -= 1;
    buckets.set(client!, b);
    done(null);
  };
  return authorizePublish;
}

/** Subscribing: ingest to every controller's topics, a controller to its own command topic. */
function subscribeGuard(log: Logger) {
  const authorizeSubscribe: Aedes['authorizeSubscribe'] = (client: Tagged, sub, done) => {
    const who = client.thawline;
    if (who?.role === 'ingest' && sub.topic.startsWith(`${topicRoot}/`)) return done(null, sub);
    if (who?.role === 'controller' && sub.topic === `${topicRoot}/${who.serial}/command`) return done(null, sub);
    log.warn({ topic: sub.topic }, 'subscription refused');
    // a null subscription answers SUBACK 0x80 (failure) and keeps the connection
    done(null, null);
  };
  return authorizeSubscribe;
}
