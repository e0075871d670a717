import net from 'node:net';

/**
 * A TCP proxy in front of the test MariaDB that a test can take down (connections cut, new ones
 * refused) or stall (connections accepted and kept open, nothing passed on either way), as a
 * crashed or a hung database server looks to the app.
 */
export class FlakyProxy {
  private server: net.Server | null = null;
  private readonly sockets = new Set<net.Socket>();
  private mode: 'up' | 'stall' = 'up';
  port = 0;

  constructor(private readonly target: { host: string; port: number }) {}

  async up(): Promise<void> {
    this.cutAll();
    this.mode = 'up';
    if (this.server) return;
    const server = net.createServer((client) => this.accept(client));
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(this.port, '127.0.0.1', () => resolve());
    });
    this.port = (server.address() as net.AddressInfo).port;
    this.server = server;
  }

  async down(): Promise<void> {
    const server = this.server;
    this.server = null;
    this.cutAll();
    if (server) await new Promise<void>((resolve) => server.close(() => resolve()));
  }

  stall(): void {
    this.mode = 'stall';
  }

  private accept(client: net.Socket): void {
    const upstream = net.connect(this.target.port, this.target.host);
    this.sockets.add(client);
    this.sockets.add(upstream);
    client.on('data', (d) => void (this.mode === 'up' && upstream.write(d)));
    upstream.on('data', (d) => void (this.mode === 'up' && client.write(d)));
    const end = () => {
      client.destroy();
      upstream.destroy();
      this.sockets.delete(client);
      this.sockets.delete(upstream);
    };
    client.on('close', end).on('error', end);
    upstream.on('close', end).on('error', end);
  }

  private cutAll(): void {
    for (const s of this.sockets) s.destroy();
    this.sockets.clear();
  }
}
