import { z } from 'zod';

/** GET /api/rosters/:rosterId/publish-preview?runId= (server/rosters/mail-preview.ts). */
export const publishPreviewQuery = z.object({ runId: z.coerce.number({ error: 'name the run to publish' }).int().min(1, 'must be a positive id') });

export interface PublishPreview {
  runId: number;
  /** False when a run was published before (the roster was reopened): only changes are mailed. */
  firstPublication: boolean;
  willMail: Array<{ personId: number; name: string; to: string; changed: number }>;
  noAddress: Array<{ personId: number; name: string }>;
  /** People whose shifts differ from the earlier publication (all people with shifts on a first one). */
  changed: Array<{ personId: number; name: string; added: number; removed: number }>;
  unchanged: number;
}
