import type { SignedInAccount } from './service';

/**
 * The last second's session reads, so a burst of reads (a screen's queries, a poll) asks the
 * database once per session instead of once per request. Anything that could change a session,
 * an account or a membership goes through a state-changing request of this server, and every
 * such request clears the whole cache when it starts and again when it ends (its writes land in
 * between). Other server processes, were there more than one, would see changes within
 * `ttlMs`. Stored as JSON text so each request parses its own copy.
 */
export class SessionCache {
  private readonly entries = new Map<string, { at: number; expires: number; data: string; account: SignedInAccount | null }>();
  /**
   * Raised by every clear and forget. A read that began before one (a GET racing a sign-out) must
   * not put what it read back, or the signed-out session would answer from here for a second.
   */
  private generation = 0;

  constructor(
    private readonly ttlMs = 1000,
    private readonly maxEntries = 10_000,
  ) {}

  get(sid: string, now = Date.now()): { data: string; account: SignedInAccount | null } | undefined {
    const e = this.entries.get(sid);
    if (!e) return undefined;
    if (now - e.at >= this.ttlMs || now >= e.expires) {
      this.entries.delete(sid);
      return undefined;
    }
    return e;
  }

  /** The mark to hand back to `remember` for a database read that starts now. */
  mark(): number {
    return this.generation;
  }

  remember(sid: string, row: { data: string; account: SignedInAccount | null; expires: number }, readFrom: number, now = Date.now()): void {
    if (readFrom !== this.generation) return;
    if (this.entries.size >= this.maxEntries) this.entries.clear();
    this.entries.set(sid, { at: now, ...row });
  }

  forget(sid: string): void {
    this.generation++;
    this.entries.delete(sid);
  }

  clear(): void {
    this.generation++;
    this.entries.clear();
  }
}
