import { z } from 'zod';

import {
  commandResultSchema,
  commandSchema,
  statusSchema,
  telemetryPayloadSchema,
  topicRoot,
  wireVersion,
} from '@/telemetry/wire';

const schemaOf = (s: z.ZodType) => {
  const { $schema: _drop, ...rest } = z.toJSONSchema(s, { io: 'input', unrepresentable: 'any' }) as Record<
    string,
    unknown
  >;
  return rest;
};

/**
 * The AsyncAPI 3.0 document of the MQTT contract between controllers and Thawline,
 * with its payload schemas taken from telemetry/wire.ts.
 */
export function asyncApiDocument(info: { version: string; brokerUrl: string; websocketUrl: string }) {
  const serial = {
    description: 'The controller serial: 3–64 letters, digits, _ or -, canonical in upper case',
    examples: ['SITE-001'],
  };
  const address = (rest: string) => `${topicRoot}/{serial}/${rest}`;
  return {
    asyncapi: '3.0.0',
    info: {
      title: 'Thawline controller contract',
      version: `${wireVersion}.0.0 (server ${info.version})`,
      description: [
        'How an antenna de-icing controller talks to Thawline over MQTT 3.1.1. Each controller signs in with its serial as user name and the password shown once at enrolment; it may publish only to its own telemetry, status and command/result topics and subscribe only to its own command topic.',
        '',
        '**Readings.** Each reading carries `boot` (new at every device start) and `seq` (0, 1, 2 … within that boot). Publish with QoS 1. Thawline stores each (boot, seq) once: a reading sent twice is harmless, and the same (boot, seq) with other content is counted as a conflict and refused. Reading times may run at most 15 minutes ahead of the server clock and no further back than the retention period.',
        '',
        '**Replay.** When Thawline sees a gap in `seq` (or a new boot starting above 0) it publishes a `replay` command for the missing range and boot; the device publishes those readings again as ordinary telemetry (batching is fine), then answers on command/result. A device that no longer holds that boot answers `ok: false`. Unfilled ranges are asked again every 10 s, up to 5 times.',
        '',
        '**Status.** Publish `{"v":1,"state":"online","boot":…}` retained on connect and set the same topic with `state: "offline"` as the last will.',
        '',
        '**Limits.** At most 512 KB per packet after CONNECT (8 KB before) and 1000 readings per message; failed sign-ins are throttled per serial and per address.',
      ].join('\n'),
    },
    defaultContentType: 'application/json',
    servers: {
      mqtt: {
        host: info.brokerUrl.replace(/^mqtts?:\/\//, ''),
        protocol: info.brokerUrl.startsWith('mqtts') ? 'secure-mqtt' : 'mqtt',
        protocolVersion: '3.1.1',
        security: [{ $ref: '#/components/securitySchemes/controllerPassword' }],
      },
      websocket: {
        host: info.websocketUrl.replace(/^wss?:\/\//, '').replace(/\/.*$/, ''),
        pathname: '/mqtt',
        protocol: info.websocketUrl.startsWith('wss') ? 'wss' : 'ws',
        security: [{ $ref: '#/components/securitySchemes/controllerPassword' }],
      },
    },
    channels: {
      telemetry: {
        address: address('telemetry'),
        parameters: { serial },
        messages: { readings: { $ref: '#/components/messages/readings' } },
      },
      status: {
        address: address('status'),
        parameters: { serial },
        messages: { status: { $ref: '#/components/messages/status' } },
      },
      command: {
        address: address('command'),
        parameters: { serial },
        messages: { command: { $ref: '#/components/messages/command' } },
      },
      result: {
        address: address('command/result'),
        parameters: { serial },
        messages: { result: { $ref: '#/components/messages/result' } },
      },
    },
    operations: {
      sendReadings: {
        action: 'send',
        channel: { $ref: '#/channels/telemetry' },
        summary: 'The controller publishes one reading or an array of up to 1000 (QoS 1)',
        bindings: { mqtt: { qos: 1, retain: false } },
      },
      sendStatus: {
        action: 'send',
        channel: { $ref: '#/channels/status' },
        summary: 'Online on connect, offline as the last will (QoS 1, retained)',
        bindings: { mqtt: { qos: 1, retain: true } },
      },
      receiveCommand: {
        action: 'receive',
        channel: { $ref: '#/channels/command' },
        summary: 'Heater mode changes and replay requests from Thawline (QoS 1)',
        bindings: { mqtt: { qos: 1 } },
      },
      sendResult: {
        action: 'send',
        channel: { $ref: '#/channels/result' },
        summary: 'The outcome of a command, by its id (QoS 1)',
        bindings: { mqtt: { qos: 1 } },
      },
    },
    components: {
      messages: {
        readings: { name: 'readings', title: 'Readings', payload: schemaOf(telemetryPayloadSchema) },
        status: { name: 'status', title: 'Status', payload: schemaOf(statusSchema) },
        command: { name: 'command', title: 'Command', payload: schemaOf(commandSchema) },
        result: { name: 'result', title: 'Command result', payload: schemaOf(commandResultSchema) },
      },
      securitySchemes: {
        controllerPassword: {
          type: 'userPassword',
          description: 'User name: the serial. Password: shown once at enrolment or rotation.',
        },
      },
    },
  };
}
