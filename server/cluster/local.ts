import { type ChildProcess, execFileSync, spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

import mqtt from 'mqtt';

import { demoControllerPassword } from '@/seeds/03_controllers';
import { dynsecAdmin } from '@/server/broker/dynsec';
import { bundleServer, serverNodeArgs } from '@/server/bundle';
import { loadConfig } from '@/server/config';
import { startGalera } from '@/server/db/galera';
import { openDb, prepareDb } from '@/server/db/knex';
import { ensureDebianPackage } from '@/server/db/mariadb';
import { startCatcher } from '@/server/mail/catcher';

export const dynsecPlugin = '/usr/lib/x86_64-linux-gnu/mosquitto_dynamic_security.so';

export type LocalClusterOptions = {
  root: string;
  /** everything lives under here: Galera nodes, mosquitto, uploads, mail */
  dir: string;
  instances: number;
  /** first HTTP port; instance k listens on httpPort + k */
  httpPort: number;
  /** first Galera node's port; node k on dbPort + k (and + 1000, + 2000, + 3000 for Galera itself) */
  dbPort: number;
  mqttPort: number;
  smtpPort: number;
  log: (line: string) => void;
  /** extra environment for every instance */
  env?: Record<string, string>;
};

const wait = async (check: () => Promise<boolean>, what: string, ms = 60_000) => {
  const end = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > end) throw new Error(`${what} did not happen within ${ms / 1000} s`);
    await new Promise((r) => setTimeout(r, 200));
  }
};

/** mosquitto with its dynamic security plugin, private to `dir`; the admin's password is made once and kept there. */
async function startMosquittoDynsec(dir: string, port: number, log: (l: string) => void) {
  ensureDebianPackage('mosquitto', 'mosquitto', log);
  fs.mkdirSync(dir, { recursive: true });
  // started as root, mosquitto runs as its own user: it reads and rewrites its files here
  fs.chmodSync(dir, 0o777);
  const secrets = path.join(dir, 'secrets.json');
  if (!fs.existsSync(secrets))
    fs.writeFileSync(
      secrets,
      JSON.stringify({
        admin: crypto.randomBytes(12).toString('base64url'),
        server: crypto.randomBytes(12).toString('base64url'),
      }),
      { mode: 0o600 },
    );
  const pw = JSON.parse(fs.readFileSync(secrets, 'utf8')) as { admin: string; server: string };
  const file = path.join(dir, 'dynsec.json');
  if (!fs.existsSync(file)) execFileSync('/usr/bin/mosquitto_ctrl', ['dynsec', 'init', file, 'admin', pw.admin]);
  fs.chmodSync(file, 0o666);
  const conf = path.join(dir, 'mosquitto.conf');
  fs.writeFileSync(
    conf,
    [
      `listener ${port} 127.0.0.1`,
      'persistence false',
      // Thawline's instances must not lose telemetry queued for them in a burst (mosquitto's default keeps 1,000)
      'max_queued_messages 50000',
      'allow_anonymous false',
      `plugin ${dynsecPlugin}`,
      `plugin_opt_config_file ${file}`,
      `log_dest file ${path.join(dir, 'mosquitto.log')}`,
      '',
    ].join('\n'),
  );
  const proc = spawn('/usr/sbin/mosquitto', ['-c', conf], { stdio: 'ignore' });
  const url = `mqtt://127.0.0.1:${port}`;
  await wait(async () => {
    try {
      await (await mqtt.connectAsync(url, { username: 'admin', password: pw.admin, reconnectPeriod: 0 })).endAsync();
      return true;
    } catch {
      return false;
    }
  }, 'mosquitto answering');
  return { url, proc, adminPassword: pw.admin, serverPassword: pw.server };
}

/**
 * Everything `npm run cluster` runs, on loopback: a 3-node Galera cluster, mosquitto
 * with dynamic security, the SMTP catcher, and N Thawline instances sharing them
 * (each its own process, so one can be killed). Migrations run once; the demo
 * network is seeded and its controllers get broker accounts with the demo password.
 */
export async function startLocalCluster(o: LocalClusterOptions) {
  fs.mkdirSync(o.dir, { recursive: true });
  const dbPorts = [0, 1, 2].map((k) => o.dbPort + k);
  const db = { database: 'thawline', user: 'thawline', password: 'thawline-cluster-dev' };
  o.log('Starting a 3-node MariaDB Galera cluster…');
  const galera = await startGalera({ dir: path.join(o.dir, 'galera'), ports: dbPorts, ...db, log: o.log });
  // what every process here needs to reach the database
  const dbEnv = {
    ...process.env,
    NODE_ENV: 'production' as const,
    DB_HOST: galera.hosts,
    DB_PORT: String(dbPorts[0]),
    DB_NAME: db.database,
    DB_USER: db.user,
    DB_PASSWORD: db.password,
    DB_MANAGED: '0',
    DATA_DIR: path.join(o.dir, 'files'),
  };
  const base = loadConfig(dbEnv);
  const knex = openDb(base);
  const { seeded } = await prepareDb(knex, { seedWhenEmpty: true });
  o.log(seeded ? 'Schema made and the demo network seeded' : 'Schema up to date');
  const broker = await startMosquittoDynsec(path.join(o.dir, 'mosquitto'), o.mqttPort, o.log);
  const admin = await dynsecAdmin(broker.url, 'admin', broker.adminPassword);
  await admin.ensureServerAccount('thawline-server', broker.serverPassword);
  // the demo controllers' accounts, once
  const demo = (await knex('controllers').where({ decommissioned: false }).pluck('serial')) as string[];
  let made = 0;
  for (const serial of demo)
    if (!(await admin.clientExists(serial))) {
      await admin.controllerAdded(serial, demoControllerPassword);
      made++;
    }
  if (made) o.log(`Broker accounts made for ${made} demo controllers`);
  await admin.close();
  const mail = await startCatcher({ port: o.smtpPort, dir: path.join(o.dir, 'files', 'mail') });

  const envFor = (k: number): NodeJS.ProcessEnv => ({
    ...dbEnv,
    PORT: String(o.httpPort + k),
    MQTT_URL: broker.url,
    MQTT_DYNSEC: '1',
    MQTT_USERNAME: 'thawline-server',
    MQTT_PASSWORD: broker.serverPassword,
    MQTT_ADMIN_USERNAME: 'admin',
    MQTT_ADMIN_PASSWORD: broker.adminPassword,
    SMTP_PORT: String(mail.port),
    SMTP_CATCHER: '0',
    SIMULATOR: '0',
    CLUSTER: '1',
    INSTANCE_ID: `thawline-${k + 1}`,
    LOG_LEVEL: process.env.LOG_LEVEL ?? 'warn',
    ...o.env,
  });
  const instances: (ChildProcess | null)[] = [];
  const urls: string[] = [];
  const serverFile = await bundleServer(o.root);
  /** starts instance k (again) and waits until it answers */
  const startInstance = async (k: number) => {
    const child = spawn(process.execPath, [...serverNodeArgs, serverFile], {
      env: envFor(k),
      cwd: o.root,
      stdio: ['ignore', 'inherit', 'inherit'],
    });
    instances[k] = child;
    const url = `http://127.0.0.1:${o.httpPort + k}`;
    await wait(
      async () => {
        if (child.exitCode != null) throw new Error(`instance ${k + 1} exited (${child.exitCode}) while starting`);
        try {
          return (await fetch(`${url}/api/health`)).status < 500;
        } catch {
          return false;
        }
      },
      `instance ${k + 1} answering on ${url}`,
    );
    urls[k] = url;
    return url;
  };
  for (let k = 0; k < o.instances; k++) await startInstance(k);
  return {
    urls,
    db: knex,
    galera,
    mqttUrl: broker.url,
    serverPassword: broker.serverPassword,
    adminPassword: broker.adminPassword,
    mail,
    startInstance,
    /** kill -9: no goodbye, leases not handed back */
    kill(k: number) {
      const c = instances[k];
      instances[k] = null;
      if (!c || c.exitCode != null) return Promise.resolve();
      const gone = new Promise((r) => c.once('exit', r));
      c.kill('SIGKILL');
      return gone;
    },
    async stop() {
      await Promise.all(
        instances.map(async (c) => {
          if (!c || c.exitCode != null) return;
          const gone = new Promise((r) => c.once('exit', r));
          c.kill('SIGTERM');
          // an instance whose database has gone may not finish its goodbye: 20 s, then kill -9
          const late = setTimeout(() => c.kill('SIGKILL'), 20_000);
          await gone;
          clearTimeout(late);
        }),
      );
      await knex.destroy();
      await mail.close();
      const brokerGone = new Promise((r) => broker.proc.once('exit', r));
      broker.proc.kill('SIGTERM');
      await brokerGone;
      await galera.stop();
    },
  };
}
