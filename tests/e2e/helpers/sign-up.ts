import type { Page } from 'playwright-core';

const headers = { 'x-rotaloom-csrf': '1' };

export interface SignUpFields {
  displayName: string;
  email: string;
  password: string;
  workspaceName: string;
  timeZone?: string;
}

/**
 * The link containing `path` in the newest mail to `to`, read from the dev mail page's JSON
 * (`/dev/mail.json`, fed by the SMTP fake): mail leaves after the answer, so it is waited for.
 */
export async function mailLink(page: Page, to: string, path: string): Promise<URL> {
  for (let i = 0; i < 50; i++) {
    const res = await page.request.get('/dev/mail.json');
    const { messages } = (await res.json()) as { messages: Array<{ to: string; links: string[] }> };
    const link = messages.find((m) => m.to.toLowerCase().includes(to.toLowerCase()))?.links.find((l) => l.includes(path));
    if (link) return new URL(link);
    await page.waitForTimeout(200);
  }
  throw new Error(`no mail to ${to} with a ${path} link`);
}

/**
 * Signs up through the API as the sign-up screen does, then finishes with the e-mailed link in
 * the same browser context (its cookie makes the password unnecessary); the context ends signed
 * in as the new workspace's admin. The session is returned.
 */
export async function signUpThroughMail(page: Page, fields: SignUpFields): Promise<{ workspace: { id: number; name: string }; user: { id: number; email: string } }> {
  const asked = await page.request.post('/api/auth/sign-up', { data: fields, headers });
  if (asked.status() !== 202) throw new Error(`sign-up: ${asked.status()} ${await asked.text()}`);
  const link = await mailLink(page, fields.email, '/finish-sign-up');
  const finished = await page.request.post('/api/auth/sign-up/finish', { data: { token: link.searchParams.get('token') }, headers });
  if (finished.status() !== 201) throw new Error(`finishing sign-up: ${finished.status()} ${await finished.text()}`);
  return finished.json();
}
