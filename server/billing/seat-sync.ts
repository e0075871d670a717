import type Stripe from 'stripe';
import { BillingAccount } from './models';
import { usageOf } from './limits';
import { applySeats } from './service';
import type { BillingConfig } from './stripe-client';

/**
 * Seat sync. The subscription's quantity follows the number of people in the workspace, once
 * changes have settled (an import of 18 people is one update, not 18). While the workspace is in
 * its trial nothing is charged, so the new count is applied at once; on a paid subscription the
 * count only changes the bill after an admin has seen the new monthly price and confirmed it
 * (the billing screen shows the pending change from GET /api/billing).
 */
export class SeatSync {
  private timers = new Map<number, ReturnType<typeof setTimeout>>();
  private running = new Set<Promise<unknown>>();

  constructor(
    private readonly stripe: Stripe,
    private readonly config: BillingConfig,
    private readonly publicUrl: string,
  ) {}

  peopleChanged(workspaceId: number): void {
    clearTimeout(this.timers.get(workspaceId));
    const timer = setTimeout(() => {
      this.timers.delete(workspaceId);
      const p = this.sync(workspaceId)
        .catch((err: unknown) => console.error(`[billing] seat sync for workspace ${workspaceId} failed: ${err instanceof Error ? err.message : String(err)}`))
        .finally(() => this.running.delete(p));
      this.running.add(p);
    }, this.config.seatSyncDelayMs);
    // A pending sync must not keep the process (or a test run) alive.
    (timer as { unref?: () => void }).unref?.();
    this.timers.set(workspaceId, timer);
  }

  /** Returns what it did, for tests and logs. */
  async sync(workspaceId: number): Promise<'applied' | 'waiting for an admin' | 'unchanged' | 'no subscription'> {
    const account = await BillingAccount.findByPk(workspaceId);
    if (!account?.subscriptionId || !account.subscriptionItemId || !['trialing', 'active', 'past_due'].includes(account.status)) return 'no subscription';
    const seats = Math.max(1, (await usageOf(workspaceId)).people);
    if (seats === account.quantity) return 'unchanged';
    if (account.status !== 'trialing') return 'waiting for an admin';
    await applySeats(workspaceId, seats, { stripe: this.stripe, config: this.config, publicUrl: this.publicUrl });
    return 'applied';
  }

  /** Waits for pending timers to fire and their syncs to finish (tests, shutdown). */
  async flush(): Promise<void> {
    while (this.timers.size > 0 || this.running.size > 0) {
      await new Promise((r) => setTimeout(r, 20));
      await Promise.all([...this.running]);
    }
  }

  stop(): void {
    for (const t of this.timers.values()) clearTimeout(t);
    this.timers.clear();
  }
}

/** The app's seat sync, set by createApp when payments are configured; the people routes call it. */
let current: SeatSync | null = null;
export const setSeatSync = (sync: SeatSync | null) => {
  current?.stop();
  current = sync;
};
export const seatSync = () => current;

/** Called by the people routes after a person is added or removed. */
export function peopleChanged(workspaceId: number | undefined): void {
  if (workspaceId) current?.peopleChanged(workspaceId);
}
