// A TCP pass-through in front of PostgreSQL that a test can cut and restore, to watch the API lose its
// database and get it back — the real pool and driver, no stand-ins.
import net from 'node:net';

export interface TcpProxy {
  port: number;
  /** Drops every connection and stops listening. */
  cut(): Promise<void>;
  /** Listens again on the same port. */
  restore(): Promise<void>;
}

export async function startTcpProxy(target: { host: string; port: number }): Promise<TcpProxy> {
  const sockets = new Set<net.Socket>();
  let server: net.Server | null = null;
  let port = 0;

  const listen = () =>
    new Promise<void>((resolve, reject) => {
      const s = net.createServer((client) => {
        const upstream = net.connect(target.port, target.host);
        for (const sock of [client, upstream]) {
          sockets.add(sock);
          sock.on('close', () => sockets.delete(sock));
          sock.on('error', () => {
            client.destroy();
            upstream.destroy();
          });
        }
        client.pipe(upstream).pipe(client);
      });
      s.once('error', reject);
      s.listen(port, '127.0.0.1', () => {
        port = (s.address() as net.AddressInfo).port;
        server = s;
        resolve();
      });
    });

  await listen();
  return {
    get port() {
      return port;
    },
    async cut() {
      const s = server;
      server = null;
      for (const sock of sockets) sock.destroy();
      if (s) await new Promise<void>((resolve) => s.close(() => resolve()));
    },
    restore: listen,
  };
}
