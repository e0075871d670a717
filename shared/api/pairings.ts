import { z } from 'zod';

export type PairingStatus = 'approved' | 'requested' | 'declined';

export const pairingsListQuery = z.object({
  status: z.enum(['approved', 'requested', 'declined']).optional(),
  q: z.string().max(120).optional(),
});

/** A pairing as GET /api/pairings lists it (create and update bodies are in shared/api/rosters.ts). */
export interface PairingDto {
  id: number;
  personAId: number;
  personBId: number;
  personAName: string;
  personBName: string;
  /** Points when both work the same shift: positive together, negative apart. */
  score: number;
  neverTogether: boolean;
  status: PairingStatus;
  reason: string | null;
  /** The staff member who asked for it (null when a coordinator made it). */
  requestedByName: string | null;
  version: number;
  updatedAt: string;
}
