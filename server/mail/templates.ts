import type { OutgoingMail } from './mailer';

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);

interface Body {
  greeting: string;
  paragraphs: string[];
  action?: { label: string; url: string };
  after?: string[];
}

/** One layout for every message: the same words in the plain-text and the HTML part. */
function render(to: string, subject: string, body: Body): OutgoingMail {
  const text = [
    body.greeting,
    '',
    ...body.paragraphs.flatMap((p) => [p, '']),
    ...(body.action ? [`${body.action.label}:`, body.action.url, ''] : []),
    ...(body.after ?? []).flatMap((p) => [p, '']),
    '— Rotaloom',
  ].join('\n');
  const p = (s: string) => `<p style="margin:0 0 16px">${escapeHtml(s)}</p>`;
  const html = `<!doctype html><html><body style="font-family:system-ui,-apple-system,sans-serif;color:#1d2a33;line-height:1.5;max-width:560px;margin:0 auto;padding:24px">
${p(body.greeting)}
${body.paragraphs.map(p).join('\n')}
${body.action ? `<p style="margin:24px 0"><a href="${escapeHtml(body.action.url)}" style="background:#1f6f5c;color:#ffffff;padding:12px 20px;border-radius:8px;text-decoration:none;display:inline-block">${escapeHtml(body.action.label)}</a></p><p style="margin:0 0 16px;font-size:13px;color:#51606b">Or paste this address into your browser: ${escapeHtml(body.action.url)}</p>` : ''}
${(body.after ?? []).map(p).join('\n')}
<p style="margin:24px 0 0;color:#51606b">— Rotaloom</p>
</body></html>`;
  return { to, subject, text, html };
}

const roleWords: Record<string, string> = {
  admin: 'an admin (members, roles and the plan, as well as rosters)',
  coordinator: 'a coordinator (people, skills and rosters)',
  staff: 'a staff member (your wishes and your published shifts)',
};

const hours = (ms: number) => Math.round(ms / 3_600_000);

export function invitationMail(input: { to: string; inviterName: string; workspaceName: string; role: string; url: string; validForMs: number }): OutgoingMail {
  return render(input.to, `${input.inviterName} invited you to ${input.workspaceName} on Rotaloom`, {
    greeting: 'Hello,',
    paragraphs: [
      `${input.inviterName} would like you to join ${input.workspaceName} on Rotaloom as ${roleWords[input.role] ?? input.role}.`,
      `The link works once and for ${Math.round(hours(input.validForMs) / 24)} days. If you have no Rotaloom account yet, you will make one on the way.`,
    ],
    action: { label: `Join ${input.workspaceName}`, url: input.url },
    after: ['Not expecting this? You can ignore it; nothing happens until the link is opened.'],
  });
}

export function passwordResetMail(input: { to: string; displayName: string; workspaceName: string | null; url: string; validForMs: number }): OutgoingMail {
  const where = input.workspaceName ? ` (you work in ${input.workspaceName})` : '';
  return render(input.to, 'Choose a new Rotaloom password', {
    greeting: `Hello ${input.displayName},`,
    paragraphs: [
      `Someone asked to choose a new password for the Rotaloom account of this address${where}.`,
      `The link works once, within ${hours(input.validForMs)} hour${hours(input.validForMs) === 1 ? '' : 's'}.`,
    ],
    action: { label: 'Choose a new password', url: input.url },
    after: ['If that was not you, ignore this message: your password stays as it is.'],
  });
}

export function confirmEmailMail(input: { to: string; displayName: string; workspaceName: string | null; url: string; validForMs: number; change: boolean }): OutgoingMail {
  return render(input.to, input.change ? 'Confirm your new Rotaloom e-mail address' : 'Confirm your Rotaloom e-mail address', {
    greeting: `Hello ${input.displayName},`,
    paragraphs: [
      input.change
        ? `You asked to sign in to Rotaloom${input.workspaceName ? ` (${input.workspaceName})` : ''} with this address from now on. It takes effect once you confirm it.`
        : `Welcome to Rotaloom${input.workspaceName ? ` and to ${input.workspaceName}` : ''}. Please confirm that this address is yours.`,
      `The link works once, within ${hours(input.validForMs)} hours.`,
    ],
    action: { label: 'Confirm this address', url: input.url },
    after: ['If you did not ask for this, you can ignore this message.'],
  });
}

/** The link that finishes a sign-up: it makes the account and the workspace, and signs in. */
export function finishSignUpMail(input: { to: string; displayName: string; workspaceName: string; url: string; validForMs: number }): OutgoingMail {
  return render(input.to, 'Finish signing up to Rotaloom', {
    greeting: `Hello ${input.displayName},`,
    paragraphs: [
      `Welcome to Rotaloom. Open the link to finish signing up: it makes the workspace ${input.workspaceName}, with you as its admin, and signs you in.`,
      `The link works once, within ${hours(input.validForMs)} hours. Opened on another device than the one you signed up on, it asks for the password you chose.`,
    ],
    action: { label: 'Finish signing up', url: input.url },
    after: ['If you did not sign up, ignore this message: no account is made unless the link is opened.'],
  });
}

/**
 * To the owner of an address someone tried to sign up with: the sign-up answered as for a new
 * address, so this message is the only place that says an account exists.
 */
export function signUpAttemptMail(input: { to: string; displayName: string; workspaceName: string | null; hasPassword: boolean; hasGoogle: boolean; signInUrl: string; resetUrl: string }): OutgoingMail {
  const where = input.workspaceName ? ` (you work in ${input.workspaceName})` : '';
  const how = input.hasPassword
    ? 'Sign in with this address and your password.'
    : input.hasGoogle
      ? 'Your account signs in with Google: choose "Sign in with Google" on the sign-in page.'
      : 'Your account has no password yet: choose one with the link below.';
  return render(input.to, 'Someone tried to sign up to Rotaloom with your address', {
    greeting: `Hello ${input.displayName},`,
    paragraphs: [`Someone, perhaps you, tried to make a new Rotaloom account with this address. You already have one${where}, so nothing was made and your account is as it was.`, how],
    action: { label: 'Sign in', url: input.signInUrl },
    after: [`Forgot your password? Choose a new one here: ${input.resetUrl}`, 'If it was not you, you can ignore this message.'],
  });
}

export function passwordChangedMail(input: { to: string; displayName: string; workspaceName: string | null }): OutgoingMail {
  return render(input.to, 'Your Rotaloom password was changed', {
    greeting: `Hello ${input.displayName},`,
    paragraphs: [
      `The password of your Rotaloom account${input.workspaceName ? ` (${input.workspaceName})` : ''} was just changed, and other devices were signed out.`,
      'If that was not you, choose a new password with "Forgot password" on the sign-in page and tell your workspace admin.',
    ],
  });
}

/** A coordinator's answer to an absence: approved (the roster will keep the person free) or declined, with the reason if one was given. */
export function absenceDecisionMail(input: { to: string; name: string; workspaceName: string; approved: boolean; what: string; reason: string | null; decidedBy: string | null; url: string }): OutgoingMail {
  const by = input.decidedBy ? ` by ${input.decidedBy}` : '';
  return render(input.to, input.approved ? `Your absence was approved: ${input.what}` : `Your absence was declined: ${input.what}`, {
    greeting: `Hello ${input.name},`,
    paragraphs: input.approved
      ? [`Your ${input.what} at ${input.workspaceName} was approved${by}. Rosters made from now on keep you free for that time.`]
      : [`Your ${input.what} at ${input.workspaceName} was declined${by}.`, ...(input.reason ? [`The reason given: ${input.reason}`] : []), 'If you would like to talk about it, please speak to your coordinator.'],
    action: { label: 'Open Rotaloom', url: input.url },
  });
}
