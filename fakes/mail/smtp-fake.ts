import { SMTPServer } from 'smtp-server';
import http from 'node:http';
import type { AddressInfo } from 'node:net';

export interface KeptMessage {
  id: number;
  from: string;
  to: string[];
  subject: string;
  receivedAt: string;
  raw: string;
}

export interface MailFake {
  smtpPort: number;
  httpPort: number;
  messages: KeptMessage[];
  stop(): Promise<void>;
}

function header(raw: string, name: string): string {
  const head = raw.split(/\r?\n\r?\n/)[0] ?? '';
  // Folded header lines continue with whitespace.
  const match = new RegExp(`^${name}:\\s*((?:.*)(?:\\r?\\n[ \\t].*)*)`, 'im').exec(head);
  return match ? match[1].replace(/\r?\n[ \t]+/g, ' ').trim() : '';
}

/**
 * A local SMTP server that keeps every message in memory, and a tiny HTTP view of them
 * (`GET /messages`, newest first) for the dev-only mail page and for tests.
 */
export async function startMailFake(options: { smtpPort?: number; httpPort?: number } = {}): Promise<MailFake> {
  const messages: KeptMessage[] = [];
  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8');
        messages.unshift({
          id: messages.length + 1,
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map((r) => r.address),
          subject: header(raw, 'Subject'),
          receivedAt: new Date().toISOString(),
          raw,
        });
        callback();
      });
    },
  });
  await new Promise<void>((resolve) => smtp.listen(options.smtpPort ?? 0, '127.0.0.1', resolve));
  const view = http.createServer((req, res) => {
    if (req.method === 'GET' && req.url === '/messages') {
      res.writeHead(200, { 'content-type': 'application/json' });
      res.end(JSON.stringify(messages));
      return;
    }
    res.writeHead(404, { 'content-type': 'application/json' });
    res.end(JSON.stringify({ error: 'not found' }));
  });
  await new Promise<void>((resolve) => view.listen(options.httpPort ?? 0, '127.0.0.1', resolve));
  return {
    smtpPort: (smtp.server.address() as AddressInfo).port,
    httpPort: (view.address() as AddressInfo).port,
    messages,
    stop: async () => {
      await new Promise<void>((resolve) => smtp.close(() => resolve()));
      await new Promise<void>((resolve) => view.close(() => resolve()));
    },
  };
}
