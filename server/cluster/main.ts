import path from 'node:path';

import { startDemoFleet } from '@/server/demo-fleet';

import { startLocalCluster } from './local';

/**
 * `npm run cluster`: the scale-out parts on one machine, on loopback — a 3-node
 * MariaDB Galera cluster, mosquitto with dynamic security, three Thawline instances
 * on ports 8080–8082 and the demo simulator. Ctrl-C stops everything.
 */
async function main() {
  const root = path.resolve(__dirname, '../..');
  const cluster = await startLocalCluster({
    root,
    dir: path.join(root, '.data', 'cluster'),
    instances: 3,
    httpPort: Number(process.env.PORT ?? 8080),
    dbPort: 13306,
    mqttPort: Number(process.env.MQTT_PORT ?? 1884),
    smtpPort: 2526,
    log: (l) => console.log(l),
  });
  const stopFleet = await startDemoFleet(cluster.db, {
    root,
    dataDir: path.join(root, '.data', 'cluster', 'files'),
    mqttUrl: cluster.mqttUrl,
    log: (l) => console.log(l),
  });
  console.log(`
  browsers ──► ${cluster.urls.join('  ')}   (any of them; sign in as on one machine)
                 │ each instance: API, /live, its share of the controllers (leases), alarm engine for those
  controllers ─► ${cluster.mqttUrl}  mosquitto + dynamic security (one account per controller)
                 │ every instance hears every reading; the owner stores it
  MariaDB ─────► Galera ${cluster.galera.hosts}  (instances write through the first node that answers)

  Kill an instance (kill -9 its pid): its controllers are taken over within about 8 s.
  Stop a Galera node: the instances move to the next node.
`);
  const stop = async () => {
    await stopFleet();
    await cluster.stop();
    process.exit(0);
  };
  process.once('SIGINT', () => void stop());
  process.once('SIGTERM', () => void stop());
}

main().catch((err: unknown) => {
  console.error(err);
  process.exit(1);
});
