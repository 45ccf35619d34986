/**
 * The controllers of the ingest benchmark, in a process of their own so that the
 * server's event loop is not also the publishers' (on a real network they are
 * devices). Started by `fork` from test/bench/ingest.ts: it connects, publishes
 * batches with QoS 1 as fast as the broker acknowledges them, stops publishing while
 * the parent says the ingest buffer is far behind, and reports what it published.
 */
import mqtt from 'mqtt';

import { reading } from './bench-reading';

type Start = { url: string; serials: string[]; password: string; seconds: number; batch: number; inflight: number };

let paused = false;
process.on('message', (m: { type: string } & Partial<Start>) => {
  if (m.type === 'pause') paused = true;
  if (m.type === 'resume') paused = false;
  if (m.type === 'start') void run(m as unknown as Start);
});

async function run(s: Start) {
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
          const now = Date.now();
          const payload =
            s.batch === 1
              ? JSON.stringify(reading(seq, now))
              : JSON.stringify(Array.from({ length: s.batch }, (_, j) => reading(seq + j, now)));
          seq += s.batch;
          published += s.batch;
          inflight.push(c.publishAsync(`thawline/v1/${serial}/telemetry`, payload, { qos: 1 }));
        }
        await Promise.all(inflight);
      }
    }),
  );
  const sendS = (Date.now() - t0) / 1000;
  await Promise.all(clients.map((c) => c.endAsync()));
  process.send!({ type: 'done', published, sendS });
}
