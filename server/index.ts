import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { type AppDeps, createApp } from './app';
import { type AppConfig, defaultOrigin } from './config';

export interface ListeningServer {
  server: Server;
  /** http://host:port */
  url: string;
  close(): Promise<void>;
}

/** The app's dependencies; without an appOrigin, the origin is the address this server listens on. */
export type ListenDeps = Omit<AppDeps, 'config'> & {
  config: Omit<AppConfig, 'appOrigin'> & { appOrigin?: string };
};

/**
 * Listens, then builds the app (a free port is known only once bound, and the app's origin may
 * depend on it); close() stops taking connections and waits.
 */
export async function listen(
  deps: ListenDeps,
  { port, host = '127.0.0.1' }: { port: number; host?: string },
): Promise<ListeningServer> {
  const server = createServer();
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const url = defaultOrigin(host, (server.address() as AddressInfo).port);
  const app = createApp({ ...deps, config: { ...deps.config, appOrigin: deps.config.appOrigin ?? url } });
  server.on('request', app);
  return {
    server,
    url,
    close: () =>
      new Promise<void>((resolve, reject) => {
        server.close((error) => (error ? reject(error) : resolve()));
        server.closeIdleConnections();
      }),
  };
}
