/** Just enough MIME to read the messages we send (nodemailer's multipart/alternative), for the dev page and tests. */
export interface DecodedMail {
  subject: string;
  to: string;
  text: string;
  html: string;
  links: string[];
}

function splitHead(raw: string): { head: string; body: string } {
  const m = /\r?\n\r?\n/.exec(raw);
  return m ? { head: raw.slice(0, m.index), body: raw.slice(m.index + m[0].length) } : { head: raw, body: '' };
}

function headerValue(head: string, name: string): string {
  const unfolded = head.replace(/\r?\n[ \t]+/g, ' ');
  const m = new RegExp(`^${name}:[ \\t]*(.*)$`, 'im').exec(unfolded);
  return m ? m[1].trim() : '';
}

function decodeQuotedPrintable(s: string): string {
  const bytes: number[] = [];
  const soft = s.replace(/=\r?\n/g, '');
  for (let i = 0; i < soft.length; i++) {
    if (soft[i] === '=' && /^[0-9A-F]{2}$/i.test(soft.slice(i + 1, i + 3))) {
      bytes.push(parseInt(soft.slice(i + 1, i + 3), 16));
      i += 2;
    } else {
      bytes.push(...Buffer.from(soft[i], 'utf8'));
    }
  }
  return Buffer.from(bytes).toString('utf8');
}

function decodeBody(body: string, encoding: string): string {
  const e = encoding.toLowerCase();
  if (e === 'quoted-printable') return decodeQuotedPrintable(body);
  if (e === 'base64') return Buffer.from(body.replace(/\s+/g, ''), 'base64').toString('utf8');
  return body;
}

/** RFC 2047 encoded words in headers (=?UTF-8?Q?...?= and =?UTF-8?B?...?=). */
export function decodeHeader(value: string): string {
  return value.replace(/=\?([^?]+)\?([QqBb])\?([^?]*)\?=\s*/g, (_m, _charset: string, kind: string, text: string) =>
    kind.toUpperCase() === 'B' ? Buffer.from(text, 'base64').toString('utf8') : decodeQuotedPrintable(text.replace(/_/g, ' ')),
  );
}

function collect(raw: string, out: { text: string; html: string }): void {
  const { head, body } = splitHead(raw);
  const type = headerValue(head, 'Content-Type') || 'text/plain';
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
  if (/^multipart\//i.test(type) && boundary) {
    const parts = body.split(`--${boundary}`).slice(1);
    for (const part of parts) {
      if (part.startsWith('--')) break;
      collect(part.replace(/^\r?\n/, ''), out);
    }
    return;
  }
  const decoded = decodeBody(body, headerValue(head, 'Content-Transfer-Encoding'));
  if (/^text\/html/i.test(type)) out.html ||= decoded;
  else if (/^text\/plain/i.test(type)) out.text ||= decoded;
}

export function decodeMail(raw: string): DecodedMail {
  const { head } = splitHead(raw);
  const out = { text: '', html: '' };
  collect(raw, out);
  const links = [...new Set(out.text.match(/https?:\/\/[^\s<>"]+/g) ?? [])];
  return { subject: decodeHeader(headerValue(head, 'Subject')), to: decodeHeader(headerValue(head, 'To')), text: out.text, html: out.html, links };
}
