import type http from 'node:http';
import { WebSocketServer, type WebSocket } from 'ws';
import type { Logger } from 'pino';
import type { LiveMessage, LiveReading } from '../../telemetry/live';
import { can } from '../../telemetry/roles';
import { sessionCookie } from '../auth';
import type { AuthService } from '../services/auth';
import type { SiteScope } from '../services/scope';

/**
 * /live: pushes readings and state changes to signed-in browsers. Readings are
 * coalesced per controller (latest wins) and sent in one frame every `batchMs`.
 */
export function startLiveHub(server: http.Server, auth: AuthService, log: Logger, scopeOf: SiteScope, batchMs = 100) {
  const wss = new WebSocketServer({ noServer: true, maxPayload: 4096 });
  // each connection sees only the sites its person may see (null: all)
  const scopes = new WeakMap<WebSocket, Set<number> | null>();
  const pending = new Map<number, LiveReading>();
  server.on('upgrade', async (req, socket, head) => {
    const url = new URL(req.url ?? '/', 'http://localhost');
    if (url.pathname !== '/live') return;
    const cookies = parseCookies(req.headers.cookie);
    const token = cookies[sessionCookie] ?? url.searchParams.get('token') ?? undefined;
    const person = token ? await auth.personForToken(token).catch(() => null) : null;
    if (!person || !can(person.role, 'readings.read')) {
      socket.write('HTTP/1.1 401 Unauthorized\r\nConnection: close\r\n\r\n');
      socket.destroy();
      return;
    }
    const scope = await scopeOf(person).catch(() => new Set<number>());
    wss.handleUpgrade(req, socket, head, (ws) => {
      scopes.set(ws, scope);
      send(ws, { type: 'hello', person: person.name });
    });
  });

  function send(ws: WebSocket, msg: LiveMessage) {
    if (ws.readyState === ws.OPEN && ws.bufferedAmount < 1_000_000) ws.send(JSON.stringify(msg));
  }
  function broadcast(msg: LiveMessage) {
    const text = JSON.stringify(msg);
    const siteId = 'siteId' in msg ? msg.siteId : null;
    for (const ws of wss.clients) {
      const scope = scopes.get(ws);
      if (siteId != null && scope && !scope.has(siteId)) continue;
      if (ws.readyState === ws.OPEN && ws.bufferedAmount < 1_000_000) ws.send(text);
    }
  }
  const timer = setInterval(() => {
    if (!pending.size) return;
    const items = [...pending.values()];
    pending.clear();
    const all = JSON.stringify({ type: 'readings', items } satisfies LiveMessage);
    for (const ws of wss.clients) {
      if (ws.readyState !== ws.OPEN || ws.bufferedAmount >= 1_000_000) continue;
      const scope = scopes.get(ws);
      if (!scope) ws.send(all);
      else {
        const mine = items.filter((i) => scope.has(i.siteId));
        if (mine.length) ws.send(JSON.stringify({ type: 'readings', items: mine } satisfies LiveMessage));
      }
    }
  }, batchMs);

  return {
    reading(r: LiveReading) {
      pending.set(r.controllerId, r);
    },
    publish: broadcast,
    clients: () => wss.clients.size,
    close() {
      clearInterval(timer);
      for (const ws of wss.clients) ws.terminate();
      wss.close();
      log.debug('live hub closed');
    },
  };
}
export type LiveHub = ReturnType<typeof startLiveHub>;

function parseCookies(header: string | undefined): Record<string, string> {
  const out: Record<string, string> = {};
  for (const part of (header ?? '').split(';')) {
    const i = part.indexOf('=');
    if (i > 0) out[part.slice(0, i).trim()] = decodeURIComponent(part.slice(i + 1).trim());
  }
  return out;
}
