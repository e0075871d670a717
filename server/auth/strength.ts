import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import { HttpError } from '../http/errors';

/**
 * zxcvbn's score 3: "safely unguessable, moderate protection from an offline slow-hash scenario"
 * (fewer than 10^10 guesses is below it). Scores 0–2 include every password on the common lists.
 */
export const MIN_SCORE = 3;

let factory: ZxcvbnFactory | null = null;

// The dictionaries are several megabytes: loaded on the first password chosen, not at start-up.
async function estimator(): Promise<ZxcvbnFactory> {
  if (!factory) {
    const [common, en] = await Promise.all([import('@zxcvbn-ts/language-common'), import('@zxcvbn-ts/language-en')]);
    factory = new ZxcvbnFactory({ dictionary: { ...common.dictionary, ...en.dictionary }, graphs: common.adjacencyGraphs, translations: en.translations });
  }
  return factory;
}

/**
 * Refuses a password that a guesser would try early: common passwords, keyboard runs, repeats,
 * and ones made of what the account itself says (its address, name, workspace). 400 naming `field`,
 * in zxcvbn's own words where it has them.
 */
export async function requireStrongPassword(password: string, field: string, about: Array<string | null | undefined> = []): Promise<void> {
  const hints = about.flatMap((s) => (s ? [s, ...s.split(/[^\p{L}\p{N}]+/u).filter((w) => w.length >= 3)] : []));
  const result = (await estimator()).check(password, hints);
  if (result.score >= MIN_SCORE) return;
  const why = result.feedback.warning ?? 'This password is easy to guess.';
  const message = `${why} Choose a longer one, for example a few unrelated words.`;
  throw new HttpError(400, 'validation_failed', message, [{ path: field, message }]);
}
