import fs from 'node:fs';
import { parseArgs } from 'node:util';

import mqtt from 'mqtt';

import { commandSchema, topics } from '@/telemetry/wire';

import { type DeviceSpec, VirtualController } from './virtual-controller';

/**
 * `npm run simulate -- --serial KTP-1 --password … [--url mqtt://127.0.0.1:1883]`
 * runs one virtual controller; `--fleet file.json` runs many ([{ serial, password, … }]).
 */
const { values } = parseArgs({
  options: {
    url: { type: 'string', default: process.env.MQTT_URL ?? 'mqtt://127.0.0.1:1883' },
    serial: { type: 'string' },
    password: { type: 'string' },
    kind: { type: 'string', default: 'heater' },
    'heater-kw': { type: 'string', default: '8' },
    'forward-w': { type: 'string', default: '5000' },
    'battery-kwh': { type: 'string' },
    interval: { type: 'string', default: '2' },
    speed: { type: 'string', default: '30' },
    dropout: { type: 'string', default: '0.01' },
    fleet: { type: 'string' },
    /** stop when stdin closes: the process that started the simulator has gone */
    'exit-with-parent': { type: 'boolean', default: false },
  },
});

if (values['exit-with-parent']) {
  process.stdin.on('end', () => process.exit(0));
  process.stdin.on('error', () => process.exit(0));
  process.stdin.resume();
}

type FleetEntry = Partial<DeviceSpec> & { serial: string; password: string };

function fleet(): FleetEntry[] {
  if (values.fleet) return JSON.parse(fs.readFileSync(values.fleet, 'utf8')) as FleetEntry[];
  if (!values.serial || !values.password) {
    console.error('Give --serial and --password (from enrolment), or --fleet file.json');
    process.exit(2);
  }
  return [
    {
      serial: values.serial,
      password: values.password,
      kind: values.kind as DeviceSpec['kind'],
      heaterKw: Number(values['heater-kw']),
      forwardW: Number(values['forward-w']),
      offGrid: values['battery-kwh'] ? { batteryKwh: Number(values['battery-kwh']) } : null,
    },
  ];
}

const intervalMs = Number(values.interval) * 1000;
const speed = Number(values.speed);
const dropout = Number(values.dropout);
const started = Date.now();

async function run(entry: FleetEntry, index: number) {
  const device = new VirtualController({
    serial: entry.serial,
    kind: entry.kind ?? 'heater',
    heaterKw: entry.heaterKw ?? 8,
    forwardW: entry.forwardW ?? 5000,
    offGrid: entry.offGrid ?? null,
    seed: entry.seed ?? index + 1,
    faultyHeater: entry.faultyHeater,
  });
  const t = topics(entry.serial);
  const client = mqtt.connect(values.url!, {
    username: entry.serial,
    password: entry.password,
    clientId: `sim-${entry.serial}`,
    protocolVersion: 4,
    reconnectPeriod: 2000,
    will: { topic: t.status, payload: Buffer.from(JSON.stringify({ v: 1, state: 'offline' })), qos: 1, retain: true },
  });
  // a field device keeps trying through outages; wrong credentials are not an outage
  await new Promise<void>((resolve, reject) => {
    client.on('error', (err) => {
      const code = (err as { code?: number }).code;
      if (code === 4 || code === 5) {
        client.end(true);
        reject(err);
      } else console.error(`simulator ${entry.serial}: ${err.message}; retrying`);
    });
    client.on('connect', () => {
      // announce (again after every reconnect: the broker may have sent the last will meanwhile)
      void client
        .publishAsync(
          t.status,
          JSON.stringify({ v: 1, state: 'online', ts: new Date().toISOString(), boot: device.boot }),
          { qos: 1, retain: true },
        )
        .catch(() => {});
      resolve();
    });
  });
  await client.subscribeAsync(t.command, { qos: 1 });
  client.on('message', (_topic, payload) => {
    let body: unknown;
    try {
      body = JSON.parse(payload.toString('utf8'));
    } catch {
      return; // not JSON: a device ignores it rather than stop reporting
    }
    const parsed = commandSchema.safeParse(body);
    if (!parsed.success) return;
    const r = device.handle(parsed.data, Date.now());
    if (r.replay.length) void client.publishAsync(t.telemetry, JSON.stringify(r.replay), { qos: 1 });
    void client.publishAsync(t.result, JSON.stringify({ v: 1, id: parsed.data.id, ok: r.ok, message: r.message }), {
      qos: 1,
    });
  });
  console.log(`simulating ${entry.serial} (${device.spec.kind}) every ${intervalMs / 1000} s`);
  // stagger the fleet over one interval
  await new Promise((r) => setTimeout(r, ((index * intervalMs) / 20) % intervalMs));
  setInterval(() => {
    const now = Date.now();
    const reading = device.sample(now, ((now - started) / 60_000) * speed);
    // a dropout: the reading stays in the device buffer and comes back on a replay request
    if (Math.random() < dropout) return;
    if (client.connected) void client.publishAsync(t.telemetry, JSON.stringify(reading), { qos: 1 }).catch(() => {});
  }, intervalMs);
}

const entries = fleet();
Promise.all(entries.map(run)).catch((e) => {
  console.error(`simulator: ${(e as Error).message}`);
  process.exit(1);
});
