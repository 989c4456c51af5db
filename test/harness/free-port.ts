/** Free local TCP ports for the servers the test harness starts (Redis, PostgreSQL, the API). */
import { createServer } from 'node:net';

/** A TCP port nobody listens on right now (common practice: bind to port 0, read it, close). */
export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
  });
}
