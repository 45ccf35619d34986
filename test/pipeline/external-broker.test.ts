import mqtt from 'mqtt';
import { afterAll, describe, expect, it } from 'vitest';

import { demoControllerPassword } from '@/seeds/03_controllers';
import { startMosquitto } from '@/test/helpers/mosquitto';
import { reading, type TestServer, testServer } from '@/test/helpers/server';
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
    const c = await mqtt.connectAsync(`mqtt://127.0.0.1:${t.broker!.port}`, {
      username: 'KTP-1',
      password: demoControllerPassword,
      reconnectPeriod: 0,
    });
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
