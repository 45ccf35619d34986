import crypto from 'node:crypto';

import mqtt from 'mqtt';

import { commandSchema } from '@/telemetry/wire';

import { reading } from './bench-reading';

export type Device = {
  serial: string;
  boot: string;
  seq: number;
  /** every reading sampled this boot, by seq: what a replay request is answered from */
  buffer: object[];
  client: mqtt.MqttClient;
  connectedAt: number;
  /** heater commands received, by command id: how many times each arrived */
  heaterCommands: Map<string, number>;
  /** reflected watts to report (a detuned antenna); default the bench reading's */
  reflectedW?: number;
};

/**
 * Virtual controllers on a broker: each samples every `intervalMs` whether
 * connected or not, keeps what it sampled, answers replay requests from that
 * buffer, and counts the heater commands it receives.
 */
export function virtualDevices(url: string, creds: { serial: string; password: string }[], intervalMs: number) {
  let publishing = true;
  const devices: Device[] = creds.map(({ serial, password }) => {
    const client = mqtt.connect(url, {
      username: serial,
      password,
      reconnectPeriod: 1000 + Math.floor(Math.random() * 1000),
      connectTimeout: 10_000,
      protocolVersion: 4,
    });
    const d: Device = {
      serial,
      boot: crypto.randomBytes(4).toString('hex'),
      seq: 0,
      buffer: [],
      client,
      connectedAt: 0,
      heaterCommands: new Map(),
    };
    client.on('connect', () => {
      d.connectedAt = Date.now();
      void client.subscribeAsync(`thawline/v1/${serial}/command`, { qos: 1 }).catch(() => {});
    });
    client.on('error', () => {});
    client.on('message', (_t, payload) => {
      const cmd = commandSchema.safeParse(JSON.parse(payload.toString()));
      if (!cmd.success) return;
      if (cmd.data.type === 'heater') {
        d.heaterCommands.set(cmd.data.id, (d.heaterCommands.get(cmd.data.id) ?? 0) + 1);
        return;
      }
      if (cmd.data.type !== 'replay' || (cmd.data.boot && cmd.data.boot !== d.boot)) return;
      const again = d.buffer.slice(cmd.data.fromSeq, cmd.data.toSeq + 1);
      if (again.length) client.publish(`thawline/v1/${serial}/telemetry`, JSON.stringify(again), { qos: 1 });
    });
    return d;
  });
  const sample = (d: Device) => {
    const r = {
      ...reading(d.seq++, Date.now(), d.boot),
      ...(d.reflectedW != null ? { reflectedW: d.reflectedW } : {}),
    };
    d.buffer.push(r);
    if (d.client.connected) d.client.publish(`thawline/v1/${d.serial}/telemetry`, JSON.stringify(r), { qos: 1 });
  };
  // staggered over one interval
  const timers: NodeJS.Timeout[] = devices.map((d, i) =>
    setTimeout(
      () => {
        sample(d);
        timers[i] = setInterval(() => publishing && sample(d), intervalMs);
      },
      (i * intervalMs) / devices.length,
    ),
  );
  return {
    devices,
    /** readings sampled so far, all devices */
    sampled: () => devices.reduce((a, d) => a + d.seq, 0),
    async allConnected(withinMs = 60_000) {
      const deadline = Date.now() + withinMs;
      while (devices.some((d) => !d.client.connected)) {
        if (Date.now() > deadline)
          throw new Error(
            `only ${devices.filter((d) => d.client.connected).length} of ${devices.length} connected in time`,
          );
        await new Promise((r) => setTimeout(r, 200));
      }
    },
    stopSampling() {
      publishing = false;
    },
    async close() {
      publishing = false;
      for (const t of timers) clearInterval(t);
      await Promise.all(devices.map((d) => d.client.endAsync(true)));
    },
  };
}
