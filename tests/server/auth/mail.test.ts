import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDb, type TestDb } from '../helpers/test-db';
import { agent, makeApp, makeUser, makeWorkspace } from './helpers';
import { startMailFake, type MailFake } from '../../../fakes/mail/smtp-fake';
import { createMailer } from '../../../server/mail/mailer';
import { invitationMail } from '../../../server/mail/templates';
import { simpleParser } from 'mailparser';
import type { Env } from '../../../server/env';

describe('e-mail over SMTP to the local fake, and the dev-only mail page', () => {
  let db: TestDb;
  let fake: MailFake;
  let env: Env;
  beforeAll(async () => {
    db = await createTestDb();
    fake = await startMailFake();
    env = { ...db.env, mail: { smtp: { host: '127.0.0.1', port: fake.smtpPort, secure: false }, from: 'Rotaloom <no-reply@rotaloom.test>', fakeUrl: `http://127.0.0.1:${fake.httpPort}` } };
  });
  afterAll(async () => {
    await fake.stop();
    await db.drop();
  });

  const waitForMail = async (to: string) => {
    for (let i = 0; i < 50; i++) {
      const found = fake.messages.find((m) => m.to.includes(to));
      if (found) return found;
      await new Promise((r) => setTimeout(r, 50));
    }
    throw new Error(`no mail to ${to}`);
  };

  it('sends a plain-text and an HTML part with our wording and the workspace name, HTML-escaped', async () => {
    const mailer = createMailer(env);
    await mailer.send(invitationMail({ to: 'quinn@example.test', inviterName: 'Ada <Boss>', workspaceName: 'Gull & <Co>', role: 'staff', url: 'http://127.0.0.1:1/invitation?token=abc', validForMs: 7 * 86_400_000 }));
    const kept = await waitForMail('quinn@example.test');
    expect(kept.raw).toMatch(/multipart\/alternative/);
    const mail = kept;
    expect(mail.subject).toBe('Ada <Boss> invited you to Gull & <Co> on Rotaloom');
    expect(mail.text).toContain('join Gull & <Co> on Rotaloom as a staff member');
    expect(mail.text).toContain('for 7 days');
    expect(mail.html).toContain('Gull &amp; &lt;Co&gt;');
    expect(mail.html).not.toContain('<Co>');
    expect(mail.text.match(/https?:\/\/\S+/g)).toEqual(['http://127.0.0.1:1/invitation?token=abc']);
  });

  // nodemailer writes non-ASCII headers as RFC 2047 encoded words and bodies as quoted-printable
  // or base64 (RFC 2045 section 6); mailparser, an independent reader, must give the text back.
  it('keeps accents, curly quotes, emoji and CJK text exactly through the encodings', async () => {
    const mailer = createMailer(env);
    const subject = 'Zoë’s shifts — 夜勤 🌙 changed';
    const line = 'Bonjour Zoë, vos créneaux “de nuit” — 夜勤のシフト 🌙 — ont changé. ';
    const text = `${line.repeat(6)}\nhttp://127.0.0.1:1/rosters/7`;
    await mailer.send({ to: 'zoe.hart@example.test', subject, text, html: `<p>${line}</p>` });
    const kept = await waitForMail('zoe.hart@example.test');
    // The raw message is encoded (so decoding is what is tested), and 7-bit clean in its headers.
    expect(kept.raw).not.toContain(subject);
    expect(kept.raw).toMatch(/^Subject: =\?UTF-8\?[QB]\?/m);
    expect(kept.subject).toBe(subject);
    expect(kept.text.trim()).toBe(text);
    expect(kept.html).toContain(`<p>${line}</p>`);
    const independent = await simpleParser(Buffer.from(kept.raw, 'utf8'));
    expect(independent.subject).toBe(subject);
    // The dev page lists the decoded message and its link.
    const app = makeApp(db, { env, mailer }).app;
    const listed = (await agent(app).get('/dev/mail.json')).body.messages.find((m: { to: string }) => m.to.includes('zoe.hart@example.test'));
    expect(listed.subject).toBe(subject);
    expect(listed.links).toEqual(['http://127.0.0.1:1/rosters/7']);
  });

  it('a password reset requested through the API arrives at the fake with a working link', async () => {
    const app = makeApp(db, { env, mailer: createMailer(env) }).app;
    const user = await makeUser({ workspace: await makeWorkspace('Brindle Lane Clinic') });
    expect((await agent(app).post('/api/auth/forgot-password').send({ email: user.email })).status).toBe(202);
    const mail = await simpleParser(Buffer.from((await waitForMail(user.email)).raw, 'utf8'));
    if (!mail.text) throw new Error('the reset mail has no plain-text part');
    expect(mail.text).toContain('Brindle Lane Clinic');
    const link = new URL(mail.text.match(/https?:\/\/\S+/g)!.find((l) => l.includes('/reset-password'))!);
    expect(link.origin).toBe(env.publicUrl);
    const reset = await agent(app).post('/api/auth/reset-password').send({ token: link.searchParams.get('token'), password: 'reset through smtp ok' });
    expect(reset.status).toBe(200);
  });

  it('lists sent mail on /dev/mail outside production, and has no such page in production', async () => {
    const app = makeApp(db, { env, mailer: createMailer(env) }).app;
    const page = await agent(app).get('/dev/mail');
    expect(page.status).toBe(200);
    expect(page.text).toContain('Sent mail');
    expect(page.text).toContain('invited you to Gull &amp; &lt;Co&gt;');
    const json = await agent(app).get('/dev/mail.json');
    expect(json.body.messages.length).toBe(fake.messages.length);

    const production = makeApp(db, { env: { ...env, nodeEnv: 'production' }, mailer: createMailer(env) }).app;
    for (const path of ['/dev/mail', '/dev/mail.json']) {
      const res = await agent(production).get(path);
      expect(res.text).not.toContain('Sent mail');
      expect(res.text).not.toContain('Gull');
    }
  });

  it('refuses to send in production without SMTP, rather than dropping the mail silently', async () => {
    const mailer = createMailer({ ...env, nodeEnv: 'production', mail: { ...env.mail, smtp: null } });
    await expect(mailer.send({ to: 'x@example.test', subject: 's', text: 't', html: 'h' })).rejects.toThrow(/not configured/);
  });
});
