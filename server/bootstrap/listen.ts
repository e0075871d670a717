import http, { type RequestListener, type Server } from 'node:http';
import net from 'node:net';

/** Words for a port someone else holds, naming the setting that moves ours. */
function busyMessage(port: number, host: string): string {
  return (
    `Port ${port} on ${host} is already in use by another program (perhaps Rotaloom from another checkout). ` +
    `Stop it, or choose another port with ROTALOOM_PORT=<port>.`
  );
}

function listenError(err: NodeJS.ErrnoException, port: number, host: string): Error {
  if (err.code === 'EADDRINUSE') return new Error(busyMessage(port, host));
  if (err.code === 'EACCES') return new Error(`Port ${port} on ${host} needs privileges this user lacks; choose another with ROTALOOM_PORT=<port>.`);
  return err;
}

/**
 * Listens with http.createServer, not Express 5's app.listen: that one calls its callback on
 * 'error' too, so a busy port looked like a successful start.
 */
export function listenHttp(handler: RequestListener, port: number, host: string): Promise<Server> {
  return new Promise((resolve, reject) => {
    const server = http.createServer(handler);
    server.once('error', (err: NodeJS.ErrnoException) => reject(listenError(err, port, host)));
    server.listen(port, host, () => resolve(server));
  });
}

/** Fails before anything is started when the app's port is taken (port 0 asks for any free one). */
export async function assertPortFree(port: number, host: string): Promise<void> {
  if (port === 0) return;
  await new Promise<void>((resolve, reject) => {
    const probe = net.createServer();
    probe.once('error', (err: NodeJS.ErrnoException) => reject(listenError(err, port, host)));
    probe.listen(port, host, () => probe.close(() => resolve()));
  });
}
