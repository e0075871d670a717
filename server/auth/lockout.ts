import { createHash } from 'node:crypto';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { transactionWithRetry } from '../db/sequelize';
import { SignInAttempt } from './models';

export const WINDOW_MS = 15 * 60 * 1000;
/** An address that signed in to the account within this long is known to it and skips the per-address limit. */
export const KNOWN_ADDRESS_MS = 30 * 24 * 60 * 60 * 1000;

export interface SignInLimits {
  /** Failures one address may make on one account in a window. */
  perAccount: number;
  /** Failures one address may make across all accounts in a window. */
  perAddress: number;
}

type Keys = { pair: string; address: string };

const keyHash = (...parts: string[]) => createHash('sha256').update(parts.join('\n'), 'utf8').digest('hex');
const keysOf = (email: string, address: string): Keys => ({ pair: keyHash('pair', email, address), address: keyHash('address', address) });

/** A sign-in that may go ahead, holding one counted failure on each key until it is settled. */
export interface Reservation {
  keys: Keys;
  email: string;
  address: string;
}

/**
 * Counts this attempt as a failure before the password is checked, under the counter rows' locks,
 * so N simultaneous wrong passwords pass a limit of L exactly L times (the check and the count are
 * one step). Failures are counted per (account, address) pair, not per account: a right password
 * from an address that has not failed is never refused because other addresses failed. The
 * per-address count stops one address trying many accounts; an address that signed in to this
 * account before is exempt from it, so many failures behind one office NAT lock out no one who
 * has used the account from there. Returns the seconds to wait when a limit is reached.
 */
export async function reserveSignIn(email: string, address: string, limits: SignInLimits): Promise<{ ok: true; reservation: Reservation } | { ok: false; retryAfter: number }> {
  const keys = keysOf(email, address);
  const known = await knownAddress(email, address);
  const sequelize = SignInAttempt.sequelize!;
  const sorted = [keys.pair, keys.address].sort();
  // Made before the transaction: INSERT IGNORE share-locks an existing row, and upgrading that to
  // the lock below inside one transaction is what makes simultaneous attempts deadlock.
  await sequelize.query('INSERT IGNORE INTO sign_in_counters (key_hash, failures, window_ends) VALUES (?, 0, ?), (?, 0, ?)', {
    replacements: [sorted[0], new Date(), sorted[1], new Date()],
  });
  return transactionWithRetry(sequelize, async (transaction) => {
    const now = new Date();
    const windowEnds = new Date(now.getTime() + WINDOW_MS);
    // locked in key order: two attempts never wait on each other in a cycle
    const rows = await sequelize.query<{ key_hash: string; failures: number; window_ends: Date }>(
      'SELECT key_hash, failures, window_ends FROM sign_in_counters WHERE key_hash IN (?, ?) ORDER BY key_hash FOR UPDATE',
      { replacements: sorted, type: QueryTypes.SELECT, transaction },
    );
    const current = (key: string) => {
      const row = rows.find((r) => r.key_hash === key)!;
      const ends = new Date(row.window_ends);
      return ends.getTime() <= now.getTime() ? { failures: 0, ends: windowEnds } : { failures: row.failures, ends };
    };
    const pair = current(keys.pair);
    const addr = current(keys.address);
    const waits: number[] = [];
    if (pair.failures >= limits.perAccount) waits.push(pair.ends.getTime() - now.getTime());
    if (!known && addr.failures >= limits.perAddress) waits.push(addr.ends.getTime() - now.getTime());
    if (waits.length) return { ok: false as const, retryAfter: Math.max(1, Math.ceil(Math.max(...waits) / 1000)) };
    await raise(keys.pair, pair, transaction);
    await raise(keys.address, addr, transaction);
    return { ok: true as const, reservation: { keys, email, address } };
  });
}

async function raise(key: string, state: { failures: number; ends: Date }, transaction: Transaction): Promise<void> {
  await SignInAttempt.sequelize!.query('UPDATE sign_in_counters SET failures = ?, window_ends = ? WHERE key_hash = ?', {
    replacements: [state.failures + 1, state.ends, key],
    transaction,
  });
}

/**
 * Records the outcome. A failure keeps the counted reservation. A success clears the pair's count
 * (whoever knows the password needs no guesses) but only takes its own reservation back from the
 * address's count, so signing in to one's own account does not reset an address's tries at others.
 */
export async function settleSignIn(reservation: Reservation, succeeded: boolean): Promise<void> {
  const sequelize = SignInAttempt.sequelize!;
  await SignInAttempt.create({ email: reservation.email.slice(0, 254), address: reservation.address.slice(0, 64), succeeded });
  // Now and then, rather than on a timer: sign-ins are what fill the table.
  if (Math.random() < 0.01) await pruneSignInCounters();
  if (!succeeded) return;
  await sequelize.query('UPDATE sign_in_counters SET failures = 0 WHERE key_hash = ?', { replacements: [reservation.keys.pair] });
  await sequelize.query('UPDATE sign_in_counters SET failures = GREATEST(failures, 1) - 1 WHERE key_hash = ?', { replacements: [reservation.keys.address] });
}

async function knownAddress(email: string, address: string): Promise<boolean> {
  const row = await SignInAttempt.findOne({
    where: { email: email.slice(0, 254), address: address.slice(0, 64), succeeded: true, createdAt: { [Op.gte]: new Date(Date.now() - KNOWN_ADDRESS_MS) } },
    attributes: ['id'],
  });
  return Boolean(row);
}

/** Counters whose window has passed say nothing; removed so the table stays small. */
async function pruneSignInCounters(): Promise<void> {
  await SignInAttempt.sequelize!.query('DELETE FROM sign_in_counters WHERE window_ends < ?', { replacements: [new Date(Date.now() - WINDOW_MS)] });
}
