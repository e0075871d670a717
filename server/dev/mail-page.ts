import { Router } from 'express';
import type { Env } from '../env';
import type { Mailer } from '../mail/mailer';

interface ListedMail {
  id: number;
  receivedAt: string;
  subject: string;
  to: string;
  text: string;
  html: string;
  links: string[];
}

/** What the SMTP fake's `GET /messages` answers: each message already read by mailparser. */
interface FakeMessage {
  id: number;
  receivedAt: string;
  subject: string;
  toHeader: string;
  text: string;
  html: string;
}

const linksIn = (text: string) => [...new Set(text.match(/https?:\/\/[^\s<>"]+/g) ?? [])];

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);

/** Messages from the SMTP fake's mailbox, or the in-memory outbox when no fake is configured; newest first. */
async function loadMessages(env: Env, mailer: Mailer): Promise<ListedMail[]> {
  if (env.mail.fakeUrl) {
    const res = await fetch(`${env.mail.fakeUrl.replace(/\/$/, '')}/messages`);
    if (!res.ok) throw new Error(`The mail fake answered ${res.status}`);
    const kept = (await res.json()) as FakeMessage[];
    return kept.map((m) => ({ id: m.id, receivedAt: m.receivedAt, subject: m.subject, to: m.toHeader, text: m.text, html: m.html, links: linksIn(m.text) }));
  }
  return mailer.outbox
    .map((m, i) => ({ id: i + 1, receivedAt: '', subject: m.subject, to: m.to, text: m.text, html: m.html, links: linksIn(m.text) }))
    .reverse();
}

/**
 * `/dev/mail`: a page listing the mail the app has sent, with working links, so invitations and
 * resets can be followed without a real inbox. createApp never mounts it in production.
 */
export function devMailRouter(env: Env, mailer: Mailer): Router {
  const router = Router();
  router.get('/mail.json', async (_req, res) => {
    res.json({ messages: await loadMessages(env, mailer) });
  });
  router.get('/mail', async (_req, res) => {
    const messages = await loadMessages(env, mailer);
    const linkify = (text: string) => escapeHtml(text).replace(/https?:\/\/[^\s<>&"]+/g, (url) => `<a href="${url}">${url}</a>`);
    const items = messages
      .map(
        (m) => `<article><h2>${escapeHtml(m.subject)}</h2><p class="meta">to ${escapeHtml(m.to)}${m.receivedAt ? ` · ${escapeHtml(m.receivedAt)}` : ''}</p><pre>${linkify(m.text)}</pre></article>`,
      )
      .join('\n');
    res.type('html').send(`<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>Sent mail · Rotaloom (development)</title>
<style>body{font-family:system-ui,sans-serif;max-width:760px;margin:0 auto;padding:16px;color:#1d2a33}article{border:1px solid #d5dde2;border-radius:8px;padding:12px 16px;margin:12px 0}h2{font-size:17px;margin:0 0 4px}.meta{color:#51606b;margin:0 0 8px;font-size:14px}pre{white-space:pre-wrap;font-family:inherit;margin:0}.note{background:#fff6dd;padding:8px 12px;border-radius:8px}</style></head>
<body><h1>Sent mail</h1><p class="note">Development only: every message Rotaloom sent, newest first. Production servers do not have this page.</p>
${items || '<p>No mail sent yet.</p>'}</body></html>`);
  });
  return router;
}
