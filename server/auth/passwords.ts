import bcrypt from 'bcryptjs';

/** bcrypt work factor; 10 is the floor we accept, tests read it back from stored hashes. */
export const BCRYPT_COST = 10;

export const hashPassword = (password: string) => bcrypt.hash(password, BCRYPT_COST);

// Compared against when the e-mail is unknown, so both failures take as long as each other.
const decoyHash = bcrypt.hashSync('rotaloom-decoy-password', BCRYPT_COST);

/** Checks a password against a stored hash; a missing hash (Google-only account) never matches but costs the same time. */
export async function checkPassword(password: string, hash: string | null | undefined): Promise<boolean> {
  const ok = await bcrypt.compare(password, hash ?? decoyHash);
  return Boolean(hash) && ok;
}
