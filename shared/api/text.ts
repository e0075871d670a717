import { z } from 'zod';

/**
 * Names and labels end up in CSV rows (RFC 4180), iCalendar lines (RFC 5545 §3.1: a bare CR or
 * NUL breaks the content line) and mail headers, so they may hold no control characters at all
 * (C0, DEL, C1) and no Unicode line or paragraph separators.
 */
const LINE_CONTROL = /[\u0000-\u001F\u007F-\u009F\u2028\u2029]/;
/** Notes may span lines (LF) and hold tabs; every other control character is refused. */
const NOTE_CONTROL = /[\u0000-\u0008\u000B-\u001F\u007F-\u009F\u2028\u2029]/;

export const noControl = (s: string) => !LINE_CONTROL.test(s);
export const noteNoControl = (s: string) => !NOTE_CONTROL.test(s);

export const CONTROL_MESSAGE = 'Control characters (such as line breaks or NUL) are not allowed here';

/** A one-line name or label: trimmed, 1..max characters, no control characters. */
export const lineText = (max: number, empty = 'Enter a name') => z.string().trim().min(1, empty).max(max, `At most ${max} characters`).refine(noControl, CONTROL_MESSAGE);
/** A free-text note: up to max characters, lines allowed, no other control characters. */
export const noteText = (max: number) => z.string().max(max, `At most ${max} characters`).refine(noteNoControl, CONTROL_MESSAGE);
