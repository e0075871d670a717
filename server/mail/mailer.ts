import nodemailer from 'nodemailer';
import type { Env } from '../env';

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  /** Messages kept in memory when no SMTP server is configured (tests without the fake). */
  readonly outbox: OutgoingMail[];
}

/**
 * Mail over SMTP (the local fake in development and tests, a real relay in production). With no
 * SMTP host configured, messages stay in memory outside production, so nothing is sent by accident.
 */
export function createMailer(env: Env): Mailer {
  const outbox: OutgoingMail[] = [];
  const smtp = env.mail.smtp;
  if (!smtp) {
    return {
      outbox,
      async send(mail) {
        if (env.nodeEnv === 'production') throw new Error('E-mail is not configured: set ROTALOOM_SMTP_HOST');
        outbox.push(mail);
      },
    };
  }
  const transport = nodemailer.createTransport({
    host: smtp.host,
    port: smtp.port,
    secure: smtp.secure,
    auth: smtp.user ? { user: smtp.user, pass: smtp.password ?? '' } : undefined,
    // The loopback fake speaks plain SMTP; a real relay is reached with TLS on or upgraded to it.
    ignoreTLS: smtp.host === '127.0.0.1' || smtp.host === 'localhost',
    connectionTimeout: 10_000,
  });
  return {
    outbox,
    async send(mail) {
      await transport.sendMail({ from: env.mail.from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html });
    },
  };
}
