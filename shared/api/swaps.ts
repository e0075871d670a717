/**
 * Swaps, giveaways and offers on a published roster (issue 17; DESIGN.md "swap", "offer"). Staff
 * propose under /api/me, coordinators decide under /api/swaps and /api/offers. Every change is
 * checked against every hard rule (scoreRoster) before anyone is asked to agree to it.
 */
import { z } from 'zod';
import { versionField } from './paging';

const seatId = z.number({ error: 'choose a shift' }).int().min(1, 'must be a positive id');
const personId = z.number({ error: 'choose a colleague' }).int().min(1, 'must be a positive id');

/** `swap`: my seat for theirs; `giveaway`: my seat to them, nothing back. */
export const swapProposalBody = z
  .object({
    kind: z.enum(['swap', 'giveaway']),
    mySeatId: seatId,
    colleagueId: personId,
    theirSeatId: seatId.nullable().optional(),
  })
  .superRefine((b, ctx) => {
    if (b.kind === 'swap' && !b.theirSeatId) ctx.addIssue({ code: 'custom', path: ['theirSeatId'], message: 'choose the colleague’s shift you would take' });
    if (b.kind === 'giveaway' && b.theirSeatId) ctx.addIssue({ code: 'custom', path: ['theirSeatId'], message: 'a giveaway takes no shift back' });
  });
export type SwapProposal = z.infer<typeof swapProposalBody>;

export const versionBody = z.object({ version: versionField });
export const decisionBody = z.object({ decision: z.enum(['approve', 'refuse']), version: versionField });

export const offerBody = z.object({
  seatId,
  /** Offer to these people only (each must be eligible); absent = everyone eligible. */
  personIds: z.array(personId).min(1, 'name at least one person, or leave the list out').max(500).optional(),
});

/** The result of checking a changed roster, kept with the swap or offer and shown to everyone. */
export interface ChangeCheck {
  ok: boolean;
  /** Hard rules the change would break (breaches the published roster did not already have). */
  breaches: string[];
  scoreBefore: number;
  scoreAfter: number;
  /** Points per score term that moved (after − before). */
  termChanges: Array<{ term: string; label: string; points: number }>;
  /** The change in words: first the total, then each term, then penalties gained or lost. */
  words: string[];
}

export interface ShiftRef {
  seatId: number;
  shiftId: number;
  label: string;
  startsLocal: string;
  endsLocal: string;
}

export interface SwapDto {
  id: number;
  rosterId: number;
  rosterName: string;
  kind: 'swap' | 'giveaway';
  status: 'proposed' | 'accepted' | 'approved' | 'refused' | 'declined' | 'withdrawn';
  proposer: { id: number; name: string };
  colleague: { id: number; name: string };
  proposerShift: ShiftRef | null;
  colleagueShift: ShiftRef | null;
  check: ChangeCheck;
  version: number;
  createdAt: string;
}

export interface OfferDto {
  id: number;
  rosterId: number;
  rosterName: string;
  status: 'open' | 'taken' | 'approved' | 'refused' | 'withdrawn';
  shift: ShiftRef | null;
  skill: string | null;
  eligible: Array<{ id: number; name: string }>;
  taker: { id: number; name: string } | null;
  check: ChangeCheck | null;
  version: number;
}

/** What a staff member can swap: their own future published shifts, and colleagues' on the same rosters. */
export interface SwapOptions {
  mine: Array<ShiftRef & { rosterId: number; rosterName: string }>;
  colleagues: Array<{ id: number; name: string; shifts: Array<ShiftRef & { rosterId: number }> }>;
}

/** An uncovered seat of a published roster, with who could take it (checked person by person). */
export interface OpenSeatDto {
  seatId: number;
  shift: ShiftRef;
  skill: string | null;
  eligible: Array<{ id: number; name: string }>;
  ineligible: Array<{ id: number; name: string; reason: string }>;
  offerId: number | null;
}

export const swapListQuery = z.object({ status: z.enum(['proposed', 'accepted', 'approved', 'refused', 'declined', 'withdrawn']).optional() });
export const offerListQuery = z.object({ status: z.enum(['open', 'taken', 'approved', 'refused', 'withdrawn']).optional() });
