/**
 * The controllers of the ingest benchmark, in a process of their own so that the
 * server's event loop is not also the publishers' (on a real network they are
 * devices). Started by `fork` from test/bench/ingest.ts: it connects, publishes
 * batches with QoS 1 as fast as the broker acknowledges them, stops publishing while
 * the parent says the ingest buffer is far behind, and reports what it published.
 */
import net from 'node:net';

import mqtt from 'mqtt';
import mqttPacket from 'mqtt-packet';

import { topics } from '@/telemetry/wire';

import { reading } from './bench-reading';

type Start = {
  url: string;
  serials: string[];
  password: string;
  seconds: number;
  batch: number;
  inflight: number;
  /** 'wire': MQTT packets written straight to the sockets (a light load generator); 'mqtt.js': the mqtt client library */
  client: 'wire' | 'mqtt.js';
};

let paused = false;
process.on('message', (m: { type: string } & Partial<Start>) => {
  if (m.type === 'pause') paused = true;
  if (m.type === 'resume') paused = false;
  if (m.type === 'start') void run(m as unknown as Start);
});

const payloadOf = (s: Start, seq: number, now: number) =>
  s.batch === 1
    ? JSON.stringify(reading(seq, now))
    : JSON.stringify(Array.from({ length: s.batch }, (_, j) => reading(seq + j, now)));

function run(s: Start) {
  return s.client === 'mqtt.js' ? runLibrary(s) : runWire(s);
}

async function runLibrary(s: Start) {
  const clients = await Promise.all(
    s.serials.map((serial) =>
      mqtt.connectAsync(s.url, {
        username: serial,
        password: s.password,
        reconnectPeriod: 0,
        protocolVersion: 4,
        connectTimeout: 15_000,
      }),
    ),
  );
  process.send!({ type: 'connected' });
  const t0 = Date.now();
  const end = t0 + s.seconds * 1000;
  let published = 0;
  await Promise.all(
    clients.map(async (c, i) => {
      const serial = s.serials[i];
      let seq = 0;
      while (Date.now() < end) {
        if (paused) {
          await new Promise((r) => setTimeout(r, 10));
          continue;
        }
        const inflight: Promise<unknown>[] = [];
        for (let k = 0; k < s.inflight; k++) {
          const payload = payloadOf(s, seq, Date.now());
          seq += s.batch;
          published += s.batch;
          inflight.push(c.publishAsync(topics(serial).telemetry, payload, { qos: 1 }));
        }
        await Promise.all(inflight);
      }
    }),
  );
  const sendS = (Date.now() - t0) / 1000;
  await Promise.all(clients.map((c) => c.endAsync()));
  process.send!({ type: 'done', published, sendS });
}

/**
 * The same controllers speaking MQTT 3.1.1 over plain sockets: CONNECT, then QoS 1
 * PUBLISH packets keeping `inflight` unacknowledged per controller, each PUBACK
 * letting the next one go. It costs a fraction of the client library's CPU, which on
 * this 2-core machine is CPU taken from the server under test.
 */
async function runWire(s: Start) {
  const { hostname, port } = new URL(s.url);
  let end = Infinity;
  let acked = 0;
  let go: () => void = () => {};
  const started = new Promise<void>((r) => (go = r));
  const one = (serial: string) =>
    new Promise<() => Promise<void>>((connected, refused) => {
      const socket = net.connect({ host: hostname, port: Number(port), noDelay: true });
      const parser = mqttPacket.parser({ protocolVersion: 4 });
      const topic = topics(serial).telemetry;
      let seq = 0;
      let inflight = 0;
      let messageId = 0;
      let scheduled = false;
      let finish: () => void = () => {};
      const finished = new Promise<void>((r) => (finish = r));
      const pump = () => {
        scheduled = false;
        if (paused) return void setTimeout(pump, 10);
        const now = Date.now();
        if (now >= end) {
          if (inflight === 0) socket.end(mqttPacket.generate({ cmd: 'disconnect' }), finish);
          return;
        }
        socket.cork();
        for (; inflight < s.inflight; inflight++) {
          messageId = (messageId % 65535) + 1;
          const payload = payloadOf(s, seq, now);
          socket.write(
            mqttPacket.generate({ cmd: 'publish', topic, payload, qos: 1, messageId, retain: false, dup: false }),
          );
          seq += s.batch;
        }
        socket.uncork();
      };
      parser.on('packet', (p) => {
        if (p.cmd === 'connack') {
          if ((p as mqttPacket.IConnackPacket).returnCode) return refused(new Error(`refused: ${serial}`));
          return connected(async () => {
            await started;
            pump();
            await finished;
          });
        }
        if (p.cmd === 'puback') {
          inflight--;
          acked += s.batch;
          // the acknowledgements of one read let the next packets go in one write
          if (!scheduled) {
            scheduled = true;
            setImmediate(pump);
          }
        }
      });
      socket.on('data', (b) => parser.parse(b));
      socket.on('error', refused);
      socket.write(
        mqttPacket.generate({
          cmd: 'connect',
          protocolId: 'MQTT',
          protocolVersion: 4,
          clean: true,
          clientId: serial,
          keepalive: 60,
          username: serial,
          password: Buffer.from(s.password),
        }),
      );
    });
  const runs = await Promise.all(s.serials.map(one));
  process.send!({ type: 'connected' });
  const t0 = Date.now();
  end = t0 + s.seconds * 1000;
  go();
  await Promise.all(runs.map((r) => r()));
  process.send!({ type: 'done', published: acked, sendS: (Date.now() - t0) / 1000 });
}
