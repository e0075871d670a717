import http from 'node:http';
import type { AddressInfo } from 'node:net';

export interface RawAnswer {
  status: number;
  headers: http.IncomingHttpHeaders;
  /** The body's bytes as sent, still compressed. */
  body: Buffer;
}

/**
 * The app on a free local port, asked through plain node:http so the bytes on the wire are read
 * as sent (supertest would decode them). Close it when done.
 */
export async function rawServer(app: http.RequestListener): Promise<{ get(url: string, acceptEncoding: string): Promise<RawAnswer>; close(): void }> {
  const server = http.createServer(app).listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const { port } = server.address() as AddressInfo;
  return {
    get: (url, acceptEncoding) =>
      new Promise<RawAnswer>((resolve, reject) => {
        http.get({ host: '127.0.0.1', port, path: url, headers: { 'Accept-Encoding': acceptEncoding } }, (r) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => resolve({ status: r.statusCode!, headers: r.headers, body: Buffer.concat(chunks) }));
        }).on('error', reject);
      }),
    close: () => server.close(),
  };
}
