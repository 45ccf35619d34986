import fs from 'node:fs';
import path from 'node:path';

import { ensureDebianPackage, type MariadbHandle, startMariadb } from './mariadb';

export const galeraProvider = '/usr/lib/galera/libgalera_smm.so';

export type GaleraNode = MariadbHandle & { name: string; stopped: boolean };

/**
 * A MariaDB Galera cluster of `ports.length` nodes on loopback, each in a folder
 * of its own under `dir`: the first node starts a new cluster, the others join it
 * and receive the data by rsync. Galera's own ports (group communication, state
 * transfer) are the node's port + 1000, + 2000 and + 3000.
 */
export async function startGalera(opts: {
  dir: string;
  ports: number[];
  database: string;
  user: string;
  password: string;
  log?: (line: string) => void;
}) {
  ensureDebianPackage('mariadbd', 'mariadb-server', opts.log);
  if (!fs.existsSync(galeraProvider)) ensureDebianPackage('garbd', 'galera-4', opts.log);
  const gcomm = (p: number) => `127.0.0.1:${p + 1000}`;
  const address = `gcomm://${opts.ports.map(gcomm).join(',')}`;
  const nodes: GaleraNode[] = [];
  const argsFor = (i: number, first: boolean) => {
    const p = opts.ports[i];
    return [
      '--wsrep-on=ON',
      `--wsrep-provider=${galeraProvider}`,
      `--wsrep-cluster-address=${address}`,
      '--wsrep-cluster-name=thawline',
      `--wsrep-node-name=node${i + 1}`,
      `--wsrep-node-address=${gcomm(p)}`,
      `--wsrep-provider-options=gmcast.listen_addr=tcp://${gcomm(p)};ist.recv_addr=127.0.0.1:${p + 2000};gcache.size=64M`,
      `--wsrep-sst-receive-address=127.0.0.1:${p + 3000}`,
      '--wsrep-sst-method=rsync',
      '--binlog-format=ROW',
      '--default-storage-engine=InnoDB',
      '--innodb-autoinc-lock-mode=2',
      ...(first ? ['--wsrep-new-cluster'] : []),
    ];
  };
  const start = async (i: number, first: boolean) => {
    // the joiner's rsync daemon runs as an unprivileged user: it must be able to write the data folder
    const nodeDir = path.join(opts.dir, `node${i + 1}`);
    fs.mkdirSync(path.join(nodeDir, 'files'), { recursive: true, mode: 0o777 });
    fs.chmodSync(nodeDir, 0o777);
    fs.chmodSync(path.join(nodeDir, 'files'), 0o777);
    const h = await startMariadb({
      dataDir: path.join(opts.dir, `node${i + 1}`),
      port: opts.ports[i],
      database: opts.database,
      user: opts.user,
      password: opts.password,
      log: opts.log,
      extraArgs: argsFor(i, first),
      startTimeoutMs: 120_000,
      // a joiner starts empty and receives the data (users included) from the cluster
      noInstall: !first && !fs.existsSync(path.join(nodeDir, 'files', 'mysql')),
    });
    return Object.assign(h, { name: `node${i + 1}`, stopped: false });
  };
  // one after another: a joiner copies the whole data set from a node already in
  for (let i = 0; i < opts.ports.length; i++) nodes.push(await start(i, i === 0));
  return {
    nodes,
    /** DB_HOST's list for the instances: every node, in order */
    hosts: opts.ports.map((p) => `127.0.0.1:${p}`).join(','),
    async stopNode(i: number) {
      await nodes[i].stop();
      nodes[i].stopped = true;
    },
    async stop() {
      // the last to stop is the one a fresh start would bootstrap from
      for (const n of [...nodes].reverse()) if (!n.stopped) await n.stop();
    },
  };
}
