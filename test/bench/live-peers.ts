/**
 * The far ends of the live benchmark, in processes of their own as they would be on a
 * network: `publish` is the controllers, `receive` a share of the browser-like /live
 * clients. Forked by test/bench/live.ts; a receiver reports its latencies when told to stop.
 */
import mqtt from 'mqtt';
import WebSocket from 'ws';

import { reading } from './bench-reading';

type Start =
  | { role: 'publish'; brokerUrl: string; serials: string[]; password: string; rate: number }
  | { role: 'receive'; url: string; cookie: string; clients: number };

let measuring = false;
const latencies: number[] = [];
let stop: () => Promise<void> = async () => {};

process.on('message', (m: { type: string; start?: Start }) => {
  if (m.type === 'start') void start(m.start!).then(() => process.send!({ type: 'ready' }));
  if (m.type === 'measure') measuring = true;
  if (m.type === 'stop') {
    measuring = false;
    void stop().then(() => process.send!({ type: 'done', latencies }));
  }
});

async function start(s: Start) {
  if (s.role === 'receive') {
    const sockets = await Promise.all(
      Array.from(
        { length: s.clients },
        () =>
          new Promise<WebSocket>((resolve, reject) => {
            const ws = new WebSocket(`${s.url.replace('http', 'ws')}/live`, {
              headers: { Cookie: s.cookie, Origin: s.url },
            });
            ws.on('open', () => resolve(ws));
            ws.on('error', reject);
            ws.on('message', (data) => {
              if (!measuring) return;
              const now = Date.now();
              const msg = JSON.parse(data.toString()) as { type: string; items?: { ts: string }[] };
              if (msg.type === 'readings') for (const i of msg.items!) latencies.push(now - Date.parse(i.ts));
            });
          }),
      ),
    );
    stop = async () => {
      for (const ws of sockets) ws.terminate();
    };
    return;
  }
  const clients = await Promise.all(
    s.serials.map((u) => mqtt.connectAsync(s.brokerUrl, { username: u, password: s.password, reconnectPeriod: 0 })),
  );
  // each controller publishes `rate` readings a second, spread evenly over the second
  const seqs = new Array<number>(clients.length).fill(0);
  const timers: NodeJS.Timeout[] = [];
  clients.forEach((c, i) => {
    timers[i] = setTimeout(
      () => {
        timers[i] = setInterval(() => {
          void c.publishAsync(`thawline/v1/${s.serials[i]}/telemetry`, JSON.stringify(reading(seqs[i]++, Date.now())), {
            qos: 0,
          });
        }, 1000 / s.rate);
      },
      (i * 1000) / s.rate / clients.length,
    );
  });
  stop = async () => {
    for (const t of timers) clearInterval(t);
    await Promise.all(clients.map((c) => c.endAsync()));
  };
}
