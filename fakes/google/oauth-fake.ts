import http from 'node:http';
import { createHash, randomBytes } from 'node:crypto';
import type { AddressInfo } from 'node:net';

/** An invented Google account the fake can sign in as. */
export interface FakeGoogleAccount {
  sub: string;
  name: string;
  givenName: string;
  familyName: string;
  email: string;
  emailVerified: boolean;
}

/** Invented test accounts. The second shares its address with the demo's staff login, to show account linking. */
export const FAKE_GOOGLE_ACCOUNTS: FakeGoogleAccount[] = [
  { sub: '104200000000000000001', name: 'Rowan Ashdown', givenName: 'Rowan', familyName: 'Ashdown', email: 'rowan.ashdown@example.com', emailVerified: true },
  { sub: '104200000000000000002', name: 'Hattie Lowther', givenName: 'Hattie', familyName: 'Lowther', email: 'staff@willowmere.example', emailVerified: true },
  { sub: '104200000000000000003', name: 'Uma Thistlewood', givenName: 'Uma', familyName: 'Thistlewood', email: 'uma.thistlewood@example.org', emailVerified: false },
];

export const FAKE_GOOGLE_CLIENT = { id: 'rotaloom-local.apps.fake-google.test', secret: 'fake-google-client-secret' };

export interface GoogleFake {
  port: number;
  url: string;
  /** What to put in ROTALOOM_GOOGLE_* so passport-google-oauth20 talks to this fake. */
  env: Record<string, string>;
  stop(): Promise<void>;
}

interface PendingCode {
  account: FakeGoogleAccount;
  clientId: string;
  redirectUri: string;
  expires: number;
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);

function readBody(req: http.IncomingMessage): Promise<URLSearchParams> {
  return new Promise((resolve, reject) => {
    let data = '';
    req.setEncoding('utf8');
    req.on('data', (c: string) => {
      data += c;
      if (data.length > 64_000) req.destroy();
    });
    req.on('end', () => resolve(new URLSearchParams(data)));
    req.on('error', reject);
  });
}

function sendJson(res: http.ServerResponse, status: number, body: unknown): void {
  res.writeHead(status, { 'content-type': 'application/json', 'cache-control': 'no-store' });
  res.end(JSON.stringify(body));
}

function redirect(res: http.ServerResponse, to: string): void {
  res.writeHead(302, { location: to });
  res.end();
}

/** A typed-in address gets a stable made-up subject id, so signing in twice finds the same account. */
function customAccount(name: string, email: string, verified: boolean): FakeGoogleAccount {
  const sub = `1099${BigInt(`0x${createHash('sha256').update(email.toLowerCase()).digest('hex').slice(0, 14)}`).toString().padStart(17, '0')}`;
  const [givenName, ...rest] = name.trim().split(/\s+/);
  return { sub, name: name.trim(), givenName: givenName ?? '', familyName: rest.join(' '), email: email.trim().toLowerCase(), emailVerified: verified };
}

function consentPage(q: URLSearchParams): string {
  const hidden = ['client_id', 'redirect_uri', 'state', 'scope']
    .map((k) => `<input type="hidden" name="${k}" value="${escapeHtml(q.get(k) ?? '')}">`)
    .join('');
  const accounts = FAKE_GOOGLE_ACCOUNTS.map(
    (a) => `<form method="post" action="/o/oauth2/v2/consent">${hidden}<input type="hidden" name="account" value="${a.sub}">
<button type="submit" class="account" data-email="${escapeHtml(a.email)}"><strong>${escapeHtml(a.name)}</strong><span>${escapeHtml(a.email)}${a.emailVerified ? '' : ' · address not verified'}</span></button></form>`,
  ).join('\n');
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>Choose an account · test Google</title>
<style>body{font-family:system-ui,sans-serif;max-width:440px;margin:32px auto;padding:0 16px;color:#202124}h1{font-size:22px}p{color:#5f6368}
.account{display:flex;flex-direction:column;align-items:flex-start;width:100%;padding:12px 16px;margin:8px 0;border:1px solid #dadce0;border-radius:8px;background:#fff;cursor:pointer;font:inherit;text-align:left}
.account span{color:#5f6368;font-size:14px}fieldset{border:1px solid #dadce0;border-radius:8px;margin:16px 0;padding:12px 16px}label{display:block;margin:8px 0 4px}input[type=text],input[type=email]{width:100%;box-sizing:border-box;padding:8px;font:inherit}
.row{display:flex;gap:12px;margin-top:16px}.primary{background:#1a73e8;color:#fff;border:0;border-radius:4px;padding:10px 16px;font:inherit;cursor:pointer}.secondary{background:none;border:1px solid #dadce0;border-radius:4px;padding:10px 16px;font:inherit;cursor:pointer}
.note{font-size:13px;background:#fef7e0;padding:8px 12px;border-radius:8px}</style></head>
<body><p class="note">Local test stand-in for Google sign-in. No real Google account is used.</p>
<h1>Choose an account</h1><p>to continue to Rotaloom. Rotaloom will see your name and e-mail address.</p>
${accounts}
<form method="post" action="/o/oauth2/v2/consent">${hidden}<fieldset><legend>Another test account</legend>
<label for="name">Name</label><input id="name" type="text" name="name" required maxlength="120">
<label for="email">E-mail</label><input id="email" type="email" name="email" required maxlength="254">
<label><input type="checkbox" name="verified" value="1" checked> Address verified</label>
<div class="row"><button type="submit" class="primary">Continue</button></div></fieldset></form>
<form method="post" action="/o/oauth2/v2/consent">${hidden}<input type="hidden" name="deny" value="1"><button type="submit" class="secondary">Cancel</button></form>
</body></html>`;
}

/**
 * A small OAuth 2 provider standing in for Google: an authorization page with consent and test
 * accounts, a token endpoint (authorization-code grant, checking client id, secret and redirect
 * URI; codes single-use and short-lived) and an OpenID-style userinfo endpoint.
 */
export async function startGoogleFake(options: { port?: number } = {}): Promise<GoogleFake> {
  const codes = new Map<string, PendingCode>();
  const tokens = new Map<string, { account: FakeGoogleAccount; expires: number }>();

  const server = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://127.0.0.1');
    const handle = async () => {
      if (req.method === 'GET' && url.pathname === '/o/oauth2/v2/auth') {
        const q = url.searchParams;
        if (q.get('client_id') !== FAKE_GOOGLE_CLIENT.id) return sendJson(res, 400, { error: 'invalid_client', error_description: 'Unknown client_id' });
        if (q.get('response_type') !== 'code') return sendJson(res, 400, { error: 'unsupported_response_type' });
        if (!q.get('redirect_uri')) return sendJson(res, 400, { error: 'invalid_request', error_description: 'redirect_uri is required' });
        res.writeHead(200, { 'content-type': 'text/html; charset=utf-8' });
        res.end(consentPage(q));
        return;
      }
      if (req.method === 'POST' && url.pathname === '/o/oauth2/v2/consent') {
        const form = await readBody(req);
        const redirectUri = form.get('redirect_uri') ?? '';
        const state = form.get('state');
        const back = new URL(redirectUri);
        if (state) back.searchParams.set('state', state);
        if (form.get('deny')) {
          back.searchParams.set('error', 'access_denied');
          return redirect(res, back.toString());
        }
        const account = form.get('account')
          ? FAKE_GOOGLE_ACCOUNTS.find((a) => a.sub === form.get('account'))
          : form.get('email') && form.get('name')
            ? customAccount(form.get('name')!, form.get('email')!, form.get('verified') === '1')
            : undefined;
        if (!account) return sendJson(res, 400, { error: 'invalid_request', error_description: 'Choose an account' });
        const code = randomBytes(16).toString('hex');
        codes.set(code, { account, clientId: form.get('client_id') ?? '', redirectUri, expires: Date.now() + 60_000 });
        back.searchParams.set('code', code);
        back.searchParams.set('scope', form.get('scope') ?? 'openid email profile');
        return redirect(res, back.toString());
      }
      if (req.method === 'POST' && url.pathname === '/token') {
        const form = await readBody(req);
        const basic = /^Basic (.+)$/.exec(req.headers.authorization ?? '')?.[1];
        const [basicId, basicSecret] = basic ? Buffer.from(basic, 'base64').toString().split(':') : [];
        const clientId = form.get('client_id') ?? basicId;
        const clientSecret = form.get('client_secret') ?? basicSecret;
        if (clientId !== FAKE_GOOGLE_CLIENT.id || clientSecret !== FAKE_GOOGLE_CLIENT.secret) return sendJson(res, 401, { error: 'invalid_client' });
        if (form.get('grant_type') !== 'authorization_code') return sendJson(res, 400, { error: 'unsupported_grant_type' });
        const code = form.get('code') ?? '';
        const pending = codes.get(code);
        codes.delete(code);
        if (!pending || pending.expires < Date.now() || pending.clientId !== clientId || pending.redirectUri !== form.get('redirect_uri')) {
          return sendJson(res, 400, { error: 'invalid_grant' });
        }
        const accessToken = `fake-${randomBytes(24).toString('hex')}`;
        tokens.set(accessToken, { account: pending.account, expires: Date.now() + 3_600_000 });
        return sendJson(res, 200, { access_token: accessToken, token_type: 'Bearer', expires_in: 3599, scope: 'openid https://www.googleapis.com/auth/userinfo.email https://www.googleapis.com/auth/userinfo.profile' });
      }
      if (req.method === 'GET' && url.pathname === '/v3/userinfo') {
        const bearer = /^Bearer (.+)$/.exec(req.headers.authorization ?? '')?.[1] ?? url.searchParams.get('access_token') ?? '';
        const found = tokens.get(bearer);
        if (!found || found.expires < Date.now()) return sendJson(res, 401, { error: 'invalid_token' });
        const a = found.account;
        return sendJson(res, 200, { sub: a.sub, name: a.name, given_name: a.givenName, family_name: a.familyName, email: a.email, email_verified: a.emailVerified, locale: 'en' });
      }
      // Browsers ask every host for an icon; an empty answer keeps their consoles clean.
      if (req.method === 'GET' && url.pathname === '/favicon.ico') {
        res.writeHead(204);
        res.end();
        return;
      }
      sendJson(res, 404, { error: 'not_found' });
    };
    handle().catch((err: unknown) => sendJson(res, 500, { error: 'server_error', error_description: err instanceof Error ? err.message : String(err) }));
  });
  await new Promise<void>((resolve) => server.listen(options.port ?? 0, '127.0.0.1', resolve));
  const port = (server.address() as AddressInfo).port;
  const url = `http://127.0.0.1:${port}`;
  return {
    port,
    url,
    env: {
      ROTALOOM_GOOGLE_CLIENT_ID: FAKE_GOOGLE_CLIENT.id,
      ROTALOOM_GOOGLE_CLIENT_SECRET: FAKE_GOOGLE_CLIENT.secret,
      ROTALOOM_GOOGLE_AUTH_URL: `${url}/o/oauth2/v2/auth`,
      ROTALOOM_GOOGLE_TOKEN_URL: `${url}/token`,
      ROTALOOM_GOOGLE_PROFILE_URL: `${url}/v3/userinfo`,
    },
    stop: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
