import { type ChildProcess, execFileSync, spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';

/**
 * Owns a private MariaDB server: installs Debian's package when missing (as root),
 * initialises a data folder, starts mariadbd on loopback, creates the database and
 * the application user, and shuts it down cleanly.
 */
export type MariadbOptions = {
  dataDir: string;
  port: number;
  database: string;
  user: string;
  password: string;
  log?: (line: string) => void;
  /** more server options (a Galera node's wsrep settings) */
  extraArgs?: string[];
  /** how long to wait for the server to answer (a Galera joiner first copies the data) */
  startTimeoutMs?: number;
  /** leave the data folder empty: a Galera joiner receives everything from the cluster */
  noInstall?: boolean;
};

export type MariadbHandle = { socket: string; port: number; pid: number; stop: () => Promise<void> };

function which(cmd: string): string | null {
  const r = spawnSync('sh', ['-c', `command -v ${cmd}`], { encoding: 'utf8' });
  return r.status === 0 ? r.stdout.trim() : null;
}

/** Makes sure a Debian package's binary exists; installs it with apt-get as root. */
export function ensureDebianPackage(binary: string, pkg: string, log: (l: string) => void = console.log): void {
  if (which(binary) || fs.existsSync(`/usr/sbin/${binary}`) || fs.existsSync(`/usr/bin/${binary}`)) return;
  const command = `apt-get update && apt-get install -y ${pkg}`;
  if (process.getuid?.() !== 0) {
    throw new Error(`${binary} is not installed. Install Debian's ${pkg} first:\n  sudo sh -c '${command}'`);
  }
  log(`Installing Debian package ${pkg} (${binary} is missing)…`);
  execFileSync('sh', ['-c', command], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
}

function binary(name: string): string {
  return which(name) ?? (fs.existsSync(`/usr/sbin/${name}`) ? `/usr/sbin/${name}` : `/usr/bin/${name}`);
}

function canConnect(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect({ host: '127.0.0.1', port });
    s.once('connect', () => {
      s.destroy();
      resolve(true);
    });
    s.once('error', () => resolve(false));
  });
}

function sql(socket: string, statement: string): void {
  execFileSync(binary('mariadb'), ['--no-defaults', `--socket=${socket}`, '-uroot', '-e', statement], {
    stdio: 'pipe',
  });
}

export async function startMariadb(opts: MariadbOptions): Promise<MariadbHandle> {
  const log = opts.log ?? (() => {});
  ensureDebianPackage('mariadbd', 'mariadb-server', log);
  const dataDir = path.resolve(opts.dataDir);
  const socket = path.join(dataDir, 'mariadb.sock');
  const files = path.join(dataDir, 'files');
  fs.mkdirSync(dataDir, { recursive: true });
  if (!opts.noInstall && !fs.existsSync(path.join(files, 'mysql'))) {
    log(`Initialising MariaDB data folder ${files}`);
    execFileSync(
      binary('mariadb-install-db'),
      [
        '--no-defaults',
        '--user=root',
        `--datadir=${files}`,
        '--skip-test-db',
        '--auth-root-authentication-method=socket',
      ],
      { stdio: 'pipe' },
    );
  }
  const pidFile = path.join(dataDir, 'mariadb.pid');
  const errLog = path.join(dataDir, 'mariadb.err');
  // a server left running on this data folder (its owner was killed): adopt it rather than start a second one
  const left = runningOn(pidFile, files);
  if (left && left.port === opts.port && (await waitFor(() => canConnect(opts.port), 10_000))) {
    log(`Adopting the MariaDB already running on ${files} (pid ${left.pid}, left by an earlier start)`);
    ensureDatabase(socket, opts);
    return adopted(left.pid, socket, opts.port);
  }
  if (left) {
    log(`Stopping the MariaDB left running on ${files} (pid ${left.pid}) to start it on port ${opts.port}`);
    await adopted(left.pid, socket, left.port).stop();
  } else fs.rmSync(pidFile, { force: true });
  if (await canConnect(opts.port)) {
    throw new Error(
      `Port ${opts.port} is in use by another program (not the MariaDB of ${files}); stop it or set DB_PORT to a free port`,
    );
  }
  const child: ChildProcess = spawn(
    binary('mariadbd'),
    [
      '--no-defaults',
      '--user=root',
      `--datadir=${files}`,
      '--bind-address=127.0.0.1',
      `--port=${opts.port}`,
      `--socket=${socket}`,
      `--pid-file=${pidFile}`,
      `--log-error=${errLog}`,
      '--character-set-server=utf8mb4',
      '--collation-server=utf8mb4_unicode_ci',
      '--innodb-buffer-pool-size=256M',
      '--innodb-flush-log-at-trx-commit=2',
      '--skip-name-resolve',
      '--max-connections=300',
      ...(opts.extraArgs ?? []),
    ],
    { detached: true, stdio: 'ignore' },
  );
  child.unref();
  let exited = false;
  child.once('exit', () => {
    exited = true;
  });
  const limitMs = opts.startTimeoutMs ?? 30_000;
  const deadline = Date.now() + limitMs;
  while (!(fs.existsSync(socket) && (await canConnect(opts.port)))) {
    if (exited) throw new Error(`mariadbd stopped during start-up; see ${errLog}`);
    if (Date.now() > deadline) throw new Error(`mariadbd did not answer within ${limitMs / 1000} s; see ${errLog}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  if (!opts.noInstall) ensureDatabase(socket, opts);
  log(`MariaDB ready on 127.0.0.1:${opts.port}`);
  let stopped = false;
  return {
    socket,
    port: opts.port,
    pid: child.pid ?? 0,
    async stop() {
      if (stopped || exited) return;
      stopped = true;
      const done = new Promise<void>((r) => child.once('exit', () => r()));
      try {
        execFileSync(binary('mariadb-admin'), ['--no-defaults', `--socket=${socket}`, '-uroot', 'shutdown'], {
          stdio: 'pipe',
        });
      } catch {
        child.kill('SIGTERM');
      }
      let timer: NodeJS.Timeout | undefined;
      await Promise.race([
        done,
        new Promise((r) => {
          timer = setTimeout(r, 20_000);
        }),
      ]);
      clearTimeout(timer);
    },
  };
}

function ensureDatabase(socket: string, opts: MariadbOptions) {
  const pw = opts.password.replace(/'/g, "''");
  sql(
    socket,
    [
      `CREATE DATABASE IF NOT EXISTS \`${opts.database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
      `CREATE USER IF NOT EXISTS '${opts.user}'@'127.0.0.1' IDENTIFIED BY '${pw}'`,
      `ALTER USER '${opts.user}'@'127.0.0.1' IDENTIFIED BY '${pw}'`,
      `GRANT ALL PRIVILEGES ON *.* TO '${opts.user}'@'127.0.0.1'`,
      'FLUSH PRIVILEGES',
    ].join('; '),
  );
}

const alive = (pid: number) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
};

/** The mariadbd named by a pid file, when it is alive and serves this data folder. */
export function runningOn(pidFile: string, files: string): { pid: number; port: number } | null {
  let pid: number;
  try {
    pid = Number(fs.readFileSync(pidFile, 'utf8').trim());
  } catch {
    return null;
  }
  if (!Number.isInteger(pid) || pid <= 0 || !alive(pid)) return null;
  let args: string[];
  try {
    args = fs.readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0');
  } catch {
    return null;
  }
  if (!args.some((a) => /mariadbd|mysqld/.test(a)) || !args.includes(`--datadir=${files}`)) return null;
  const port = Number(args.find((a) => a.startsWith('--port='))?.slice(7) ?? 3306);
  return { pid, port };
}

async function waitFor(check: () => Promise<boolean>, ms: number): Promise<boolean> {
  const deadline = Date.now() + ms;
  while (Date.now() < deadline) {
    if (await check()) return true;
    await new Promise((r) => setTimeout(r, 100));
  }
  return false;
}

/** A handle on a server this process did not start: stopped through its socket, waited for by pid. */
function adopted(pid: number, socket: string, port: number): MariadbHandle {
  let stopped = false;
  return {
    socket,
    port,
    pid,
    async stop() {
      if (stopped) return;
      stopped = true;
      try {
        execFileSync(binary('mariadb-admin'), ['--no-defaults', `--socket=${socket}`, '-uroot', 'shutdown'], {
          stdio: 'pipe',
        });
      } catch {
        if (alive(pid)) process.kill(pid, 'SIGTERM');
      }
      await waitFor(async () => !alive(pid), 20_000);
    },
  };
}
