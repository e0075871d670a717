import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import http from 'node:http';
import type { AddressInfo } from 'node:net';

export interface KeptMessage {
  id: number;
  from: string;
  to: string[];
  /** Decoded by mailparser (RFC 2047 words, charsets, quoted-printable, base64, multipart). */
  subject: string;
  /** The To header as written, decoded; the envelope's recipients are in `to`. */
  toHeader: string;
  text: string;
  html: string;
  receivedAt: string;
  raw: string;
}

export interface MailFake {
  smtpPort: number;
  httpPort: number;
  messages: KeptMessage[];
  stop(): Promise<void>;
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
        const rawBytes = Buffer.concat(chunks);
        simpleParser(rawBytes).then(
          (mail) => {
            messages.unshift({
              id: messages.length + 1,
              from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
              to: session.envelope.rcptTo.map((r) => r.address),
              subject: mail.subject ?? '',
              toHeader: mail.to ? [mail.to].flat().map((a) => a.text).join(', ') : '',
              text: mail.text ?? '',
              html: typeof mail.html === 'string' ? mail.html : '',
              receivedAt: new Date().toISOString(),
              raw: rawBytes.toString('utf8'),
            });
            callback();
          },
          // A message mailparser cannot read is refused, as a real server would, not kept half-read.
          (err: Error) => callback(Object.assign(new Error(`unreadable message: ${err.message}`), { responseCode: 554 })),
        );
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
