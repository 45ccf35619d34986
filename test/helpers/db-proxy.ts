import net from 'node:net';

/**
 * A TCP relay in front of the test MariaDB, so one test server can lose its
 * database (every connection cut, new ones refused) while other test files keep
 * theirs. `cut()` starts the outage, `restore()` ends it.
 */
export async function dbProxy(targetPort: number) {
  const sockets = new Set<net.Socket>();
  let server: net.Server | null = null;
  let port = 0;
  const listen = () =>
    new Promise<void>((resolve, reject) => {
      server = net.createServer((client) => {
        const upstream = net.connect({ host: '127.0.0.1', port: targetPort });
        for (const s of [client, upstream]) {
          sockets.add(s);
          s.on('close', () => sockets.delete(s));
          s.on('error', () => {
            client.destroy();
            upstream.destroy();
          });
        }
        client.pipe(upstream).pipe(client);
      });
      server.once('error', reject);
      server.listen(port, '127.0.0.1', () => {
        port = (server!.address() as net.AddressInfo).port;
        resolve();
      });
    });
  await listen();
  return {
    get port() {
      return port;
    },
    async cut() {
      const closing = new Promise<void>((r) => (server ? server.close(() => r()) : r()));
      server = null;
      for (const s of sockets) s.destroy();
      await closing;
    },
    restore: listen,
    close: async () => {
      const closing = new Promise<void>((r) => (server ? server.close(() => r()) : r()));
      for (const s of sockets) s.destroy();
      await closing;
    },
  };
}
export type DbProxy = Awaited<ReturnType<typeof dbProxy>>;
