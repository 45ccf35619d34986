import type http from 'node:http';
import type { Duplex } from 'node:stream';

import { parse as parseCookie } from 'cookie';
import type { Logger } from 'pino';
import { type WebSocket, WebSocketServer } from 'ws';

import { sessionCookie } from '@/server/auth';
import { isDbUnavailable } from '@/server/errors';
import type { AuthService } from '@/server/services/auth';
import type { SiteScope } from '@/server/services/scope';
import type { Person } from '@/telemetry/api';
import type { SystemHealth } from '@/telemetry/health';
import type { LiveMessage, LiveReading } from '@/telemetry/live';
import { can } from '@/telemetry/roles';

/**
 * /live: pushes readings and state changes to signed-in browsers. A reading goes
 * out in the event-loop turn it was accepted in (see `flush`).
 * Sign-in is by the session cookie only; every socket is checked again when
 * sessions, people or on-call lists change (and every `recheckMs`), so a signed-out
 * or deactivated person, or a technician taken off a site, stops receiving at once.
 */
export type LiveHubOptions = {
  recheckMs?: number;
  allowedOrigin: (origin: string | undefined, host: string | undefined) => boolean;
};

type Conn = { token: string; person: Person; scope: Set<number> | null };

export function startLiveHub(auth: AuthService, log: Logger, scopeOf: SiteScope, opts: LiveHubOptions) {
  const wss = new WebSocketServer({ noServer: true, maxPayload: 4096 });
  const conns = new Map<WebSocket, Conn>();
  const pending = new Map<number, LiveReading>();
  let health: SystemHealth | null = null;

  const refuse = (socket: Duplex, status: string) => {
    socket.end(`HTTP/1.1 ${status}\r\nConnection: close\r\nContent-Length: 0\r\n\r\n`);
  };

  /** Called by the server's one upgrade dispatcher for /live. */
  async function upgrade(req: http.IncomingMessage, socket: Duplex, head: Buffer) {
    if (!opts.allowedOrigin(req.headers.origin, req.headers.host)) return refuse(socket, '403 Forbidden');
    // cookie.parse leaves a value it cannot decode as it is, never throws on it
    const token = parseCookie(req.headers.cookie ?? '')[sessionCookie];
    if (!token) return refuse(socket, '401 Unauthorized');
    let person: Person | null;
    let scope: Set<number> | null;
    try {
      person = await auth.personForToken(token);
      scope = person ? await scopeOf(person) : null;
    } catch (err) {
      // the database is away: say so, rather than look like a sign-out
      if (!isDbUnavailable(err)) log.error({ err }, 'live sign-in check failed');
      return refuse(socket, '503 Service Unavailable');
    }
    if (!person || !can(person.role, 'readings.read')) return refuse(socket, '401 Unauthorized');
    if (socket.destroyed) return;
    wss.handleUpgrade(req, socket, head, (ws) => {
      conns.set(ws, { token, person: person!, scope });
      ws.on('close', () => conns.delete(ws));
      ws.on('error', () => conns.delete(ws));
      send(ws, { type: 'hello', person: person!.name });
      if (health) send(ws, { type: 'system', health });
    });
  }

  /** Checks every socket's session and scope again; closes those no longer signed in. */
  async function checkAll() {
    try {
      for (const [ws, c] of [...conns]) {
        const person = await auth.personForToken(c.token);
        if (!person || !can(person.role, 'readings.read')) {
          conns.delete(ws);
          ws.close(4401, 'signed out');
          continue;
        }
        c.person = person;
        c.scope = await scopeOf(person);
      }
    } catch (err) {
      if (!isDbUnavailable(err)) log.warn({ err }, 'live recheck failed');
    }
  }
  let rechecking: Promise<void> | null = null;
  let again = false;
  function recheck(): Promise<void> {
    // a change during a pass may come after that pass read its socket: run once more
    if (rechecking) {
      again = true;
      return rechecking;
    }
    rechecking = checkAll().finally(() => {
      rechecking = null;
      if (again) {
        again = false;
        void recheck();
      }
    });
    return rechecking;
  }
  const recheckTimer = setInterval(() => void recheck(), opts.recheckMs ?? 15_000);

  const open = (ws: WebSocket) => ws.readyState === ws.OPEN && ws.bufferedAmount < 1_000_000;
  function send(ws: WebSocket, msg: LiveMessage) {
    if (open(ws)) ws.send(JSON.stringify(msg));
  }
  function broadcast(msg: LiveMessage) {
    const text = JSON.stringify(msg);
    const siteId = 'siteId' in msg ? msg.siteId : null;
    for (const [ws, c] of conns) {
      if (siteId != null && c.scope && !c.scope.has(siteId)) continue;
      if (open(ws)) ws.send(text);
    }
  }
  /**
   * Readings go out as soon as they are accepted: whatever arrives within one turn
   * of the event loop travels in one message. Readings of one controller that meet
   * in the same turn keep only the newest (counted as coalesced), which under a
   * flood is the overload protection: the loop's turns lengthen and batches grow.
   */
  const stats = { messages: 0, readings: 0, coalesced: 0 };
  let scheduled = false;
  function flush() {
    scheduled = false;
    if (!pending.size) return;
    const items = [...pending.values()];
    pending.clear();
    stats.messages++;
    stats.readings += items.length;
    const all = JSON.stringify({ type: 'readings', items } satisfies LiveMessage);
    for (const [ws, c] of conns) {
      // run from setImmediate: one socket's failure must neither reach the process nor stop the others
      try {
        if (!open(ws)) continue;
        if (!c.scope) ws.send(all);
        else {
          const mine = items.filter((i) => c.scope!.has(i.siteId));
          if (mine.length) ws.send(JSON.stringify({ type: 'readings', items: mine } satisfies LiveMessage));
        }
      } catch (err) {
        log.warn({ err: (err as Error).message }, 'live send failed; closing that socket');
        ws.terminate();
      }
    }
  }

  return {
    upgrade,
    recheck,
    reading(r: LiveReading) {
      if (pending.has(r.controllerId)) stats.coalesced++;
      pending.set(r.controllerId, r);
      if (!scheduled) {
        scheduled = true;
        setImmediate(flush);
      }
    },
    /** messages and readings sent, and readings that met a newer one of the same controller in one turn */
    stats: () => ({ ...stats }),
    publish: broadcast,
    /** the system's health: kept for new sockets, sent to all when its state changes */
    system(h: SystemHealth) {
      // while something is wrong its words change ("for 40 s"), so they are sent again
      const changed = !health || JSON.stringify(health.parts) !== JSON.stringify(h.parts);
      health = h;
      if (changed) broadcast({ type: 'system', health: h });
    },
    clients: () => conns.size,
    /**
     * Closes every browser's socket with "going away" (1001); browsers reconnect on
     * their own, to this instance or another. Used when the server shuts down.
     */
    disconnectAll(reason = 'server going away') {
      for (const ws of wss.clients) ws.close(1001, reason);
    },
    close() {
      clearInterval(recheckTimer);
      for (const ws of wss.clients) ws.terminate();
      wss.close();
      log.debug('live hub closed');
    },
  };
}
export type LiveHub = ReturnType<typeof startLiveHub>;
