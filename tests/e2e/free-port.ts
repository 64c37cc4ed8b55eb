import { createServer } from 'node:net';

/**
 * A port free right now, so a server can be started on a known address: the links it e-mails carry
 * PUBLIC_URL, which must name the port the browser uses.
 */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      probe.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
    });
  });
}
