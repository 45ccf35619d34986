import { type ChildProcess, execFileSync, spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';

import { afterAll, describe, expect, it } from 'vitest';

import { freePort } from '@/test/helpers/ports';
import { until } from '@/test/helpers/wait';

/**
 * `npm start` owns its children: after a kill -9 of the supervisor the server and the
 * simulator stop, the next start adopts the MariaDB left running on the data folder,
 * and a crash of the server process is restarted and recorded once.
 */
const root = path.resolve(__dirname, '../..');
const dataDir = path.join(root, '.data', `test-start-${crypto.randomBytes(4).toString('hex')}`);
const started: ChildProcess[] = [];
let env: NodeJS.ProcessEnv;

const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};
const childrenOf = (pid: number) => {
  try {
    return execFileSync('ps', ['-o', 'pid=,args=', '--ppid', String(pid)], { encoding: 'utf8' })
      .trim()
      .split('\n')
      .filter(Boolean)
      .map((l) => ({ pid: Number(l.trim().split(/\s+/)[0]), args: l.trim() }));
  } catch {
    return [];
  }
};

function start() {
  const p = spawn(process.execPath, ['--import', 'tsx', 'server/start.ts'], {
    cwd: root,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  p.stdout!.on('data', (d) => (out += d));
  p.stderr!.on('data', (d) => (out += d));
  started.push(p);
  return { p, output: () => out };
}
const health = async () => {
  try {
    return (await fetch(`http://127.0.0.1:${env.PORT}/api/health`)).status;
  } catch {
    return 0;
  }
};

afterAll(async () => {
  for (const p of started) if (p.exitCode == null) p.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, 3000));
  const pidFile = path.join(dataDir, 'mariadb', 'mariadb.pid');
  if (fs.existsSync(pidFile)) {
    const pid = Number(fs.readFileSync(pidFile, 'utf8'));
    if (alive(pid)) process.kill(pid, 'SIGKILL');
  }
  fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('npm start', () => {
  it('starts cleanly after kill -9, adopting MariaDB, and restarts a crashed server as one recorded event', async () => {
    env = {
      ...process.env,
      NODE_ENV: 'development',
      DATA_DIR: dataDir,
      PORT: String(await freePort()),
      DB_PORT: String(await freePort()),
      MQTT_PORT: String(await freePort()),
      SMTP_PORT: String(await freePort()),
      SIMULATOR: '1',
      LOG_LEVEL: 'info',
    };
    const first = start();
    await until(() => first.output().includes('Thawline is running'), 'first start', 90_000);
    expect(await health()).toBe(200);
    const server = childrenOf(first.p.pid!).find((c) => c.args.includes('serve.cjs'))!;
    expect(server).toBeTruthy();
    // the server runs from its bundle under plain node, with its young-generation size (server/bundle.ts)
    expect(server.args).not.toMatch(/tsx/);
    expect(server.args).toContain('--max-semi-space-size=64');
    await until(() => childrenOf(server.pid).some((c) => c.args.includes('simulator')), 'simulator running', 20_000);
    const simulator = childrenOf(server.pid).find((c) => c.args.includes('simulator'))!;

    first.p.kill('SIGKILL');
    // the server sees its supervisor gone and stops; the simulator follows its server
    await until(() => !alive(server.pid) && !alive(simulator.pid), 'server and simulator stopped', 20_000);
    const mariadbPid = Number(fs.readFileSync(path.join(dataDir, 'mariadb', 'mariadb.pid'), 'utf8'));
    expect(alive(mariadbPid)).toBe(true);

    const second = start();
    await until(() => second.output().includes('Thawline is running'), 'second start', 90_000);
    expect(second.output()).toContain('Adopting the MariaDB already running');
    expect(second.output()).not.toMatch(/already in use/);
    expect(await health()).toBe(200);

    // a crash of the server process: restarted by the supervisor, recorded once
    const server2 = childrenOf(second.p.pid!).find((c) => c.args.includes('serve.cjs'))!;
    process.kill(server2.pid, 'SIGKILL');
    await until(
      async () =>
        childrenOf(second.p.pid!).some((c) => c.args.includes('serve.cjs') && c.pid !== server2.pid) &&
        (await health()) === 200,
      'server restarted',
      60_000,
    );
    const mysql = (q: string) =>
      execFileSync(
        'mariadb',
        [
          '--no-defaults',
          `--socket=${path.join(dataDir, 'mariadb', 'mariadb.sock')}`,
          '-uroot',
          '-N',
          '-e',
          q,
          'thawline',
        ],
        { encoding: 'utf8' },
      ).trim();
    await until(
      () => mysql("SELECT COUNT(*) FROM system_events WHERE kind = 'crash-restart'") === '1',
      'crash recorded',
    );

    second.p.kill('SIGTERM');
    await until(() => second.p.exitCode != null && !alive(mariadbPid), 'everything stopped', 30_000);
  }, 240_000);
});
