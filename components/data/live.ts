import { useSyncExternalStore } from 'react';

import type { BoardController, BoardSite } from '@/telemetry/board';
import type { SystemHealth } from '@/telemetry/health';
import { liveMessageSchema, type LiveReading } from '@/telemetry/live';
import { TrendRing } from '@/telemetry/trend';

/**
 * Live values per site. Each tile subscribes to its own site only; frames from
 * /live are applied at once but announced to tiles a few sites at a time, so no
 * frame of the screen carries all of them.
 */
const trendCap = 90;
/** Work per animation frame for tile updates; the rest waits for the next frame, so no frame runs long. */
const frameBudgetMs = 8;
const nextFrame: (cb: () => void) => unknown =
  typeof requestAnimationFrame === 'function' ? (cb) => requestAnimationFrame(cb) : (cb) => setTimeout(cb, 0);
const clock = () => (typeof performance !== 'undefined' ? performance.now() : Date.now());

type SiteView = { version: number; controllers: BoardController[] };

class LiveStore {
  private sites = new Map<number, SiteView>();
  /** each controller's live trend: a reading is one write into its ring, no array copied */
  private rings = new Map<number, TrendRing>();
  private listeners = new Map<number, Set<() => void>>();
  private dirty = new Set<number>();
  private frameRequested = false;
  private statusListeners = new Set<() => void>();
  private alarmListeners = new Set<(m: { alarmId: number; siteId: number; state: string }) => void>();
  connection: 'connecting' | 'open' | 'closed' = 'closed';
  /** when the link last closed, for "link lost 40 s ago" */
  closedAt: number | null = null;
  /** when the last reading arrived over the link (this browser's clock), for "newest reading 2 s ago" */
  lastReadingAt: number | null = null;
  /** the server's own health, as /live last reported it */
  health: SystemHealth | null = null;

  /** readings that came before the first snapshot; applied once it lands */
  private early: LiveReading[] = [];

  seed(snapshot: BoardSite[]) {
    for (const s of snapshot) {
      const old = this.sites.get(s.siteId);
      // keep a live value that is newer than the snapshot's
      const controllers = s.controllers.map((c) => {
        // the snapshot's trend starts the ring again
        this.rings.delete(c.id);
        const mine = old?.controllers.find((o) => o.id === c.id);
        return mine?.latest && (!c.latest || mine.latest.ts > c.latest.ts)
          ? { ...c, latest: mine.latest, status: mine.status }
          : c;
      });
      this.sites.set(s.siteId, { version: (old?.version ?? 0) + 1, controllers });
      this.dirty.add(s.siteId);
    }
    const early = this.early;
    this.early = [];
    if (early.length) this.apply(early);
    this.schedule();
  }

  apply(items: LiveReading[]) {
    if (items.length) this.lastReadingAt = Date.now();
    for (const r of items) {
      const site = this.sites.get(r.siteId);
      if (!site) {
        if (this.early.length < 2000) this.early.push(r);
        continue;
      }
      const controllers = site.controllers.map((c) => {
        if (c.id !== r.controllerId) return c;
        let ring = this.rings.get(c.id);
        if (!ring) this.rings.set(c.id, (ring = TrendRing.from(c.trend, trendCap)));
        return { ...c, status: 'online' as const, latest: r, trend: ring.push(Date.parse(r.ts), r.vswr) };
      });
      this.sites.set(r.siteId, { version: site.version + 1, controllers });
      this.dirty.add(r.siteId);
    }
    this.schedule();
  }

  setStatus(siteId: number, controllerId: number, status: BoardController['status']) {
    const site = this.sites.get(siteId);
    if (!site) return;
    this.sites.set(siteId, {
      version: site.version + 1,
      controllers: site.controllers.map((c) => (c.id === controllerId ? { ...c, status } : c)),
    });
    this.dirty.add(siteId);
    this.schedule();
  }

  /**
   * Marks controllers silent when their readings stop, without waiting for the server;
   * but not while this browser's own link is down: that is one banner, not every tile.
   */
  sweepSilence(now = Date.now()) {
    if (this.connection !== 'open') return;
    for (const [siteId, site] of this.sites) {
      let changed = false;
      const controllers = site.controllers.map((c) => {
        const last = c.latest ? Date.parse(c.latest.ts) : null;
        if (c.status === 'online' && last != null && now - last > c.intervalS * 1000 * 3) {
          changed = true;
          return { ...c, status: 'silent' as const };
        }
        return c;
      });
      if (changed) {
        this.sites.set(siteId, { version: site.version + 1, controllers });
        this.dirty.add(siteId);
      }
    }
    this.schedule();
  }

  /**
   * Changed tiles are told in the next animation frame: as soon as the browser can
   * paint, and no more work per frame than its budget (the rest in the next one).
   */
  private schedule() {
    if (this.frameRequested || !this.dirty.size) return;
    this.frameRequested = true;
    nextFrame(() => {
      this.frameRequested = false;
      const start = clock();
      for (const id of [...this.dirty]) {
        this.dirty.delete(id);
        this.listeners.get(id)?.forEach((l) => l());
        if (clock() - start > frameBudgetMs) break;
      }
      this.schedule();
    });
  }

  subscribe = (siteId: number, cb: () => void) => {
    let set = this.listeners.get(siteId);
    if (!set) this.listeners.set(siteId, (set = new Set()));
    set.add(cb);
    return () => set!.delete(cb);
  };

  get = (siteId: number): SiteView | undefined => this.sites.get(siteId);

  onAlarm(cb: (m: { alarmId: number; siteId: number; state: string }) => void) {
    this.alarmListeners.add(cb);
    return () => this.alarmListeners.delete(cb);
  }
  alarm(m: { alarmId: number; siteId: number; state: string }) {
    this.alarmListeners.forEach((l) => l(m));
  }

  private visitListeners = new Set<() => void>();
  onVisit(cb: () => void) {
    this.visitListeners.add(cb);
    return () => this.visitListeners.delete(cb);
  }
  visit() {
    this.visitListeners.forEach((l) => l());
  }

  private networkListeners = new Set<() => void>();
  onNetwork(cb: () => void) {
    this.networkListeners.add(cb);
    return () => this.networkListeners.delete(cb);
  }
  network() {
    this.networkListeners.forEach((l) => l());
  }

  onConnection(cb: () => void) {
    this.statusListeners.add(cb);
    return () => this.statusListeners.delete(cb);
  }
  setConnection(c: LiveStore['connection']) {
    if (c === 'closed' && this.connection !== 'closed') this.closedAt = Date.now();
    if (c === 'open') this.closedAt = null;
    this.connection = c;
    this.statusListeners.forEach((l) => l());
  }
  setHealth(h: SystemHealth) {
    this.health = h;
    this.statusListeners.forEach((l) => l());
  }
}

export const liveStore = new LiveStore();

export function useSiteLive(siteId: number): SiteView | undefined {
  return useSyncExternalStore(
    (cb) => liveStore.subscribe(siteId, cb),
    () => liveStore.get(siteId),
  );
}

export function useLiveConnection() {
  return useSyncExternalStore(
    (cb) => liveStore.onConnection(cb),
    () => liveStore.connection,
  );
}

export function useSystemHealth() {
  return useSyncExternalStore(
    (cb) => liveStore.onConnection(cb),
    () => liveStore.health,
  );
}

let socket: WebSocket | null = null;
let users = 0;
let retry = 0;
let sweep: ReturnType<typeof setInterval> | null = null;

/** Opens /live while at least one screen needs it; reconnects with backoff. */
export function connectLive(): () => void {
  users++;
  if (users === 1) {
    open();
    sweep = setInterval(() => liveStore.sweepSilence(), 2000);
  }
  return () => {
    users--;
    if (users === 0) {
      socket?.close();
      socket = null;
      if (sweep) clearInterval(sweep);
    }
  };
}

function open() {
  if (typeof window === 'undefined' || typeof WebSocket === 'undefined') return;
  const base = process.env.EXPO_PUBLIC_API_URL ?? window.location.origin;
  const ws = new WebSocket(`${base.replace(/^http/, 'ws')}/live`);
  socket = ws;
  liveStore.setConnection('connecting');
  ws.onopen = () => {
    retry = 0;
    liveStore.setConnection('open');
    // whatever changed while the link was down: fetch it again
    liveStore.alarm({ alarmId: 0, siteId: 0, state: 'resync' });
    liveStore.visit();
    liveStore.network();
  };
  ws.onmessage = (e) => {
    const parsed = liveMessageSchema.safeParse(JSON.parse(String(e.data)));
    if (!parsed.success) return;
    const m = parsed.data;
    if (m.type === 'readings') liveStore.apply(m.items);
    if (m.type === 'controller') liveStore.setStatus(m.siteId, m.controllerId, m.status);
    if (m.type === 'alarm') liveStore.alarm(m);
    if (m.type === 'visit') liveStore.visit();
    if (m.type === 'network') liveStore.network();
    if (m.type === 'system') liveStore.setHealth(m.health);
  };
  ws.onclose = () => {
    liveStore.setConnection('closed');
    if (socket !== ws || users === 0) return;
    retry = Math.min(retry + 1, 6);
    setTimeout(() => users > 0 && socket === ws && open(), 500 * 2 ** retry);
  };
}
