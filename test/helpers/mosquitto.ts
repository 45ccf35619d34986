import { type ChildProcess, execFileSync, spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

import mqtt from 'mqtt';

import { freePort } from './ports';
import { until } from './wait';

export const dynsecPlugin = '/usr/lib/x86_64-linux-gnu/mosquitto_dynamic_security.so';

/**
 * Debian's mosquitto on a free loopback port, in a folder of its own. With
 * `dynsec`, anonymous clients are refused and its dynamic security plugin holds the
 * clients, roles and ACLs, with one admin (`admin`) allowed to change them.
 */
export async function startMosquitto(
  opts: {
    dynsec?: { adminPassword: string };
    /** for benchmarks: log errors only, and queue up to this many messages per client instead of 1,000 */
    bench?: { queue: number };
  } = {},
) {
  const port = await freePort();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'thawline-mosquitto-'));
  // started as root, mosquitto runs as its own user: it must be able to read (and rewrite) its files here
  fs.chmodSync(dir, 0o777);
  const conf = path.join(dir, 'mosquitto.conf');
  const logFile = path.join(dir, 'mosquitto.log');
  const lines = [
    `listener ${port} 127.0.0.1`,
    'persistence false',
    `log_dest file ${logFile}`,
    ...(opts.bench
      ? ['log_type error', `max_queued_messages ${opts.bench.queue}`, 'max_inflight_messages 0']
      : ['log_type all']),
  ];
  if (opts.dynsec) {
    const file = path.join(dir, 'dynsec.json');
    execFileSync('/usr/bin/mosquitto_ctrl', ['dynsec', 'init', file, 'admin', opts.dynsec.adminPassword], {
      stdio: 'ignore',
    });
    fs.chmodSync(file, 0o666);
    lines.push('allow_anonymous false', `plugin ${dynsecPlugin}`, `plugin_opt_config_file ${file}`);
  } else lines.push('allow_anonymous true');
  fs.writeFileSync(conf, `${lines.join('\n')}\n`);
  const proc: ChildProcess = spawn('/usr/sbin/mosquitto', ['-c', conf], { stdio: 'ignore' });
  const url = `mqtt://127.0.0.1:${port}`;
  await until(async () => {
    try {
      const probe = await mqtt.connectAsync(url, {
        reconnectPeriod: 0,
        connectTimeout: 500,
        ...(opts.dynsec ? { username: 'admin', password: opts.dynsec.adminPassword } : {}),
      });
      await probe.endAsync();
      return true;
    } catch {
      return false;
    }
  }, 'mosquitto listening');
  return {
    url,
    port,
    /** the broker's own log (every connection, subscription, refusal) */
    log: () => (fs.existsSync(logFile) ? fs.readFileSync(logFile, 'utf8') : ''),
    async stop() {
      const gone = new Promise((r) => proc.once('exit', r));
      proc.kill('SIGTERM');
      await gone;
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
