import mqtt from 'mqtt';
import { afterAll, describe, expect, it } from 'vitest';

import { demoControllerPassword } from '@/seeds/03_controllers';
import { ackPerRead } from '@/server/ingest/source';
import { startMosquitto } from '@/test/helpers/mosquitto';
import { demoController, reading, type TestServer, testServer } from '@/test/helpers/server';
import { until } from '@/test/helpers/wait';

const count = async (t: TestServer, serial: string) =>
  Number(
    (
      await t
        .db('readings as r')
        .join('controllers as c', 'c.id', 'r.controller_id')
        .where('c.serial', serial)
        .count<{ n: number }[]>({ n: '*' })
    )[0].n,
  );

const cleanups: (() => Promise<void> | void)[] = [];
afterAll(async () => {
  for (const c of cleanups.reverse()) await c();
});

describe('ingest as an ordinary MQTT client', () => {
  it('of the embedded broker, over a socket instead of in-process', async () => {
    const t = await testServer({ ingestVia: 'mqtt', ingest: { flushMs: 50 } });
    cleanups.push(() => t.close());
    const c = await demoController(t, 'KTP-1');
    await c.publishAsync('thawline/v1/KTP-1/telemetry', JSON.stringify([reading({ seq: 0 }), reading({ seq: 1 })]), {
      qos: 1,
    });
    await until(async () => (await count(t, 'KTP-1')) === 2, 'two readings through the socket hop');
    await c.endAsync();
  });

  it('controllers may also reach the embedded broker over WebSocket on /mqtt, with the same ACL', async () => {
    const t = await testServer({ ingest: { flushMs: 50 } });
    cleanups.push(() => t.close());
    const ws = `${t.url.replace('http', 'ws')}/mqtt`;
    await expect(mqtt.connectAsync(ws, { username: 'OXS-1', password: 'wrong', reconnectPeriod: 0 })).rejects.toThrow();
    const c = await mqtt.connectAsync(ws, { username: 'OXS-1', password: demoControllerPassword, reconnectPeriod: 0 });
    await c.publishAsync('thawline/v1/OXS-1/telemetry', JSON.stringify(reading({ seq: 0 })), { qos: 1 });
    await until(async () => (await count(t, 'OXS-1')) === 1, 'a reading over MQTT-over-WebSocket');
    await c.endAsync();
  });

  it("of Debian's mosquitto, chosen by MQTT_URL, with replay requests going back through it", async () => {
    const broker = await startMosquitto();
    cleanups.push(() => broker.stop());
    const port = broker.port;
    const t = await testServer({ env: { MQTT_URL: `mqtt://127.0.0.1:${port}` }, ingest: { flushMs: 50 } });
    cleanups.push(() => t.close());
    expect(t.broker).toBeNull();
    const c = await mqtt.connectAsync(`mqtt://127.0.0.1:${port}`, { clientId: 'SBF-1', reconnectPeriod: 0 });
    const commands: { type: string; fromSeq: number; toSeq: number }[] = [];
    c.on('message', (_t, p) => commands.push(JSON.parse(p.toString())));
    await c.subscribeAsync('thawline/v1/SBF-1/command', { qos: 1 });
    await c.publishAsync('thawline/v1/SBF-1/telemetry', JSON.stringify(reading({ seq: 0 })), { qos: 1 });
    await until(async () => (await count(t, 'SBF-1')) === 1, 'first reading via mosquitto');
    await c.publishAsync('thawline/v1/SBF-1/telemetry', JSON.stringify(reading({ seq: 4 })), { qos: 1 });
    const replay = await until(() => commands.find((x) => x.type === 'replay'), 'replay request via mosquitto');
    expect(replay).toMatchObject({ fromSeq: 1, toSeq: 3 });
    await c.endAsync();
  });
});

describe('ingest as a client of a broker in front', () => {
  it('acknowledges the QoS 1 messages of one read in one write, every one acknowledged', async () => {
    const broker = await startMosquitto();
    cleanups.push(() => broker.stop());
    const url = `mqtt://127.0.0.1:${broker.port}`;
    const ingest = await mqtt.connectAsync(url, { clientId: 'ack-check', reconnectPeriod: 0 });
    ackPerRead(ingest);
    await ingest.subscribeAsync('thawline/v1/+/telemetry', { qos: 1 });
    const socket = ingest.stream as unknown as Record<'_write' | '_writev', (...a: unknown[]) => unknown>;
    let writes = 0;
    let bytes = 0;
    for (const name of ['_write', '_writev'] as const) {
      const original = socket[name];
      socket[name] = function counted(this: unknown, ...a: unknown[]) {
        writes++;
        bytes +=
          name === '_write'
            ? (a[0] as Buffer).length
            : (a[0] as { chunk: Buffer }[]).reduce((n, c) => n + c.chunk.length, 0);
        return original.apply(this, a);
      };
    }
    let got = 0;
    ingest.on('message', () => got++);
    const device = await mqtt.connectAsync(url, { clientId: 'ack-device', reconnectPeriod: 0 });
    // sent together, so the broker hands them on in a few reads
    await Promise.all(
      Array.from({ length: 50 }, (_, i) =>
        device.publishAsync('thawline/v1/ACK-1/telemetry', JSON.stringify(reading({ seq: i })), { qos: 1 }),
      ),
    );
    await until(
      () => got === 50,
      () => `50 messages (got ${got})`,
    );
    // every PUBACK (4 bytes each) sent, nothing else
    await until(
      () => bytes === 50 * 4,
      () => `50 acknowledgements written (${bytes} bytes)`,
    );
    // one write per PUBACK before; a few (one per read) now
    expect(writes).toBeLessThan(10);
    await device.endAsync();
    await ingest.endAsync();
  });
});
