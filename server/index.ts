import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { type AppDeps, createApp } from './app';

export interface ListeningServer {
  server: Server;
  /** http://host:port */
  url: string;
  close(): Promise<void>;
}

/** Builds the app from ready dependencies and listens; close() stops taking connections and waits. */
export async function listen(
  deps: AppDeps,
  { port, host = '127.0.0.1' }: { port: number; host?: string },
): Promise<ListeningServer> {
  const app = createApp(deps);
  const server = await new Promise<Server>((resolve, reject) => {
    const started = app.listen(port, host, (error?: Error) => (error ? reject(error) : resolve(started)));
  });
  const address = server.address() as AddressInfo;
  const shownHost = host === '0.0.0.0' || host === '::' ? 'localhost' : host;
  return {
    server,
    url: `http://${shownHost.includes(':') ? `[${shownHost}]` : shownHost}:${address.port}`,
    close: () =>
      new Promise<void>((resolve, reject) => {
        server.close((error) => (error ? reject(error) : resolve()));
        server.closeIdleConnections();
      }),
  };
}
