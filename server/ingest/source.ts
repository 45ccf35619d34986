import type { Duplex } from 'node:stream';

import type { Aedes } from 'aedes';
import mqtt from 'mqtt';

import { topicRoot } from '@/telemetry/wire';

/**
 * Where ingest gets its messages: in-process from the embedded broker (no socket
 * hop, ~1.4× faster), or as an ordinary MQTT client of any broker (MQTT_URL).
 */
export type MessageSource = {
  name: string;
  start: (onMessage: (topic: string, payload: Buffer) => void) => Promise<void>;
  publish: (topic: string, payload: string) => Promise<void>;
  close: () => Promise<void>;
  /** whether messages can flow now */
  connected: () => boolean;
};

const subscriptions = [`${topicRoot}/+/telemetry`, `${topicRoot}/+/status`, `${topicRoot}/+/command/result`];

export function inProcessSource(aedes: Aedes): MessageSource {
  let deliver: ((packet: { topic: string; payload: Buffer | string }, cb: () => void) => void) | null = null;
  return {
    name: 'embedded broker (in-process)',
    async start(onMessage) {
      deliver = (packet, cb) => {
        onMessage(packet.topic, typeof packet.payload === 'string' ? Buffer.from(packet.payload) : packet.payload);
        cb();
      };
      for (const topic of subscriptions)
        await new Promise<void>((r) => aedes.subscribe(topic, deliver as never, () => r()));
    },
    publish: (topic, payload) =>
      new Promise((resolve, reject) =>
        aedes.publish(
          { cmd: 'publish', topic, payload: Buffer.from(payload), qos: 1, retain: false, dup: false } as never,
          (err?: Error) => (err ? reject(err) : resolve()),
        ),
      ),
    connected: () => !aedes.closed,
    async close() {
      if (!deliver) return;
      for (const topic of subscriptions)
        await new Promise<void>((r) => aedes.unsubscribe(topic, deliver as never, () => r()));
    },
  };
}

/**
 * `also`: topics of Thawline's own (the instances' shared bus) and their handler;
 * their messages bypass ingest.
 */
export function mqttSource(
  url: string,
  username: string,
  password: string,
  also?: { topics: string[]; onMessage: (topic: string, payload: Buffer) => void },
): MessageSource {
  let client: mqtt.MqttClient | null = null;
  const topics = [...subscriptions, ...(also?.topics ?? [])];
  const own = new Set(also?.topics ?? []);
  return {
    name: `MQTT client of ${new URL(url).host}`,
    async start(onMessage) {
      client = await mqtt.connectAsync(url, {
        username,
        password,
        clientId: `thawline-ingest-${process.pid}-${Date.now()}`,
        clean: true,
        reconnectPeriod: 1000,
        protocolVersion: 4,
      });
      ackPerRead(client);
      client.on('message', (topic, payload) =>
        own.has(topic) ? also!.onMessage(topic, payload) : onMessage(topic, payload),
      );
      // resubscribe after a reconnect with a clean session
      client.on('connect', () => {
        // a refused resubscription is seen as no messages (health), never as a crash
        client?.subscribeAsync(topics, { qos: 1 }).catch(() => {});
      });
      await client.subscribeAsync(topics, { qos: 1 });
    },
    async publish(topic, payload) {
      if (!client) throw new Error('ingest client not started');
      await client.publishAsync(topic, payload, { qos: 1 });
    },
    connected: () => client?.connected ?? false,
    async close() {
      await client?.endAsync();
    },
  };
}

/**
 * mqtt.js acknowledges each QoS 1 message as it handles it, and each PUBACK left in a
 * write of its own: one system call per reading, an eighth of the server's time when
 * a broker in front delivers thousands a second. Holding the socket's writes from a
 * read until the event loop turns sends the acknowledgements of one read together.
 */
export function ackPerRead(client: mqtt.MqttClient) {
  const seen = new WeakSet<Duplex>();
  const hold = () => {
    const stream = client.stream as Duplex | undefined;
    if (!stream || seen.has(stream)) return;
    seen.add(stream);
    let held = false;
    stream.prependListener('data', () => {
      if (held || stream.destroyed) return;
      held = true;
      stream.cork();
      setImmediate(() => {
        held = false;
        stream.uncork();
      });
    });
  };
  hold();
  // a reconnect brings a new socket
  client.on('connect', hold);
}
