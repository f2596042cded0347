/** Promise wrappers around http.Server listen/close. */
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';

/** Starts listening and resolves with the bound port (useful with port 0). */
export function listen(server: Server, port: number, host: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const onError = (err: Error) => reject(err);
    server.once('error', onError);
    server.listen(port, host, () => {
      server.off('error', onError);
      resolve((server.address() as AddressInfo).port);
    });
  });
}

/**
 * Stops accepting connections and resolves once open ones have ended. Idle keep-alive
 * sockets are closed at once; busy ones get `graceMs` before they are cut.
 */
export function closeServer(server: Server, graceMs = 5000): Promise<void> {
  if (!server.listening) return Promise.resolve();
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => server.closeAllConnections(), graceMs);
    timer.unref();
    server.close((err) => {
      clearTimeout(timer);
      if (err) reject(err);
      else resolve();
    });
    server.closeIdleConnections();
  });
}
