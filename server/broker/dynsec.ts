import crypto from 'node:crypto';

import mqtt from 'mqtt';

import { topicRoot } from '@/telemetry/wire';

import { busTopic } from '../cluster/bus';

const controlTopic = '$CONTROL/dynamic-security/v1';

type Acl = { acltype: string; topic: string; allow: boolean; priority?: number };
type Command = Record<string, unknown> & { command: string };

/** The topics one controller may use: its own, nothing else. */
export function controllerAcls(serial: string): Acl[] {
  const t = `${topicRoot}/${serial}`;
  return [
    { acltype: 'publishClientSend', topic: `${t}/telemetry`, allow: true },
    { acltype: 'publishClientSend', topic: `${t}/status`, allow: true },
    { acltype: 'publishClientSend', topic: `${t}/command/result`, allow: true },
    { acltype: 'subscribePattern', topic: `${t}/command`, allow: true },
    { acltype: 'publishClientReceive', topic: `${t}/command`, allow: true },
  ];
}

/** What a Thawline instance may do: hear every controller, command them, and talk to the other instances. */
export const serverAcls: Acl[] = [
  ...['telemetry', 'status', 'command/result'].flatMap((c) => [
    { acltype: 'subscribePattern', topic: `${topicRoot}/+/${c}`, allow: true },
    { acltype: 'publishClientReceive', topic: `${topicRoot}/+/${c}`, allow: true },
  ]),
  { acltype: 'publishClientSend', topic: `${topicRoot}/+/command`, allow: true },
  { acltype: 'subscribePattern', topic: busTopic, allow: true },
  { acltype: 'publishClientReceive', topic: busTopic, allow: true },
  { acltype: 'publishClientSend', topic: busTopic, allow: true },
];

export class DynsecError extends Error {}

/**
 * mosquitto's dynamic security plugin, driven over MQTT by its admin account: each
 * controller gets a client of its own (its serial and one-time password) and a role
 * allowing its own topics only, so enrolment, a new password and decommissioning
 * take effect at the broker as they do with the embedded one.
 */
export async function dynsecAdmin(url: string, username: string, password: string) {
  const client = await mqtt.connectAsync(url, {
    username,
    password,
    clientId: `thawline-dynsec-${process.pid}-${crypto.randomBytes(3).toString('hex')}`,
    reconnectPeriod: 1000,
    protocolVersion: 4,
  });
  const waiting = new Map<string, { resolve: (r: unknown[]) => void; reject: (e: Error) => void }>();
  // each answer echoes the correlationData its command carried
  client.on('message', (_topic, payload) => {
    let responses: { correlationData?: string }[];
    try {
      responses = (JSON.parse(payload.toString()) as { responses: { correlationData?: string }[] }).responses;
    } catch {
      return;
    }
    const id = responses[0]?.correlationData?.split('#')[0];
    const w = id ? waiting.get(id) : undefined;
    if (!w) return;
    waiting.delete(id!);
    w.resolve(responses);
  });
  await client.subscribeAsync(`${controlTopic}/response`, { qos: 1 });

  /** Sends commands in one message; errors other than those `tolerate` allows are thrown. */
  async function send(commands: Command[], tolerate: RegExp | null = null) {
    const id = crypto.randomUUID();
    const answer = new Promise<unknown[]>((resolve, reject) => {
      waiting.set(id, { resolve, reject });
      setTimeout(() => {
        if (waiting.delete(id)) reject(new DynsecError('the broker did not answer the security change within 5 s'));
      }, 5000).unref();
    });
    await client.publishAsync(
      controlTopic,
      JSON.stringify({ commands: commands.map((c, k) => ({ ...c, correlationData: `${id}#${k}` })) }),
      { qos: 1 },
    );
    const responses = (await answer) as { command: string; error?: string }[];
    for (const r of responses)
      if (r.error && !(tolerate && tolerate.test(r.error)))
        throw new DynsecError(`broker refused ${r.command}: ${r.error}`);
    return responses;
  }

  const role = (serial: string) => `controller-${serial}`;
  return {
    /** The servers' own account and role, made or brought up to date (at start). */
    async ensureServerAccount(user: string, pass: string) {
      await send([{ command: 'createRole', rolename: 'thawline-server', acls: serverAcls }], /exist/i);
      // the role's topics as this version of Thawline needs them (an older role gains the new ones)
      for (const acl of serverAcls)
        await send([{ command: 'addRoleACL', rolename: 'thawline-server', ...acl }], /exist/i);
      const [got] = (await send([{ command: 'getClient', username: user }], /not found/i)) as {
        error?: string;
        data?: { client?: { roles?: { rolename: string }[] } };
      }[];
      // made once; its password is not set again here, which would disconnect every instance using it
      if (got.error)
        await send([
          { command: 'createClient', username: user, password: pass, roles: [{ rolename: 'thawline-server' }] },
        ]);
      else if (!got.data?.client?.roles?.some((r) => r.rolename === 'thawline-server'))
        await send([{ command: 'addClientRole', username: user, rolename: 'thawline-server' }]);
    },
    async controllerAdded(serial: string, pass: string) {
      await send(
        [
          { command: 'createRole', rolename: role(serial), acls: controllerAcls(serial) },
          { command: 'createClient', username: serial, password: pass, roles: [{ rolename: role(serial) }] },
        ],
        null,
      );
    },
    async passwordChanged(serial: string, pass: string) {
      await send([{ command: 'setClientPassword', username: serial, password: pass }]);
      // the old password's session ends at once
      await send([{ command: 'disableClient', username: serial }]);
      await send([{ command: 'enableClient', username: serial }]);
    },
    async controllerRemoved(serial: string) {
      // deleting the client disconnects it
      await send(
        [
          { command: 'deleteClient', username: serial },
          { command: 'deleteRole', rolename: role(serial) },
        ],
        /not found|does not exist/i,
      );
    },
    async clientExists(serial: string) {
      const [r] = (await send([{ command: 'getClient', username: serial }], /not found/i)) as { error?: string }[];
      return !r.error;
    },
    close: () => client.endAsync(),
  };
}
export type DynsecAdmin = Awaited<ReturnType<typeof dynsecAdmin>>;
