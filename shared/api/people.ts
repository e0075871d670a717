import { z } from 'zod';
import { listQuerySchema, versionField } from './paging';
import { CONTROL_MESSAGE, lineText, noControl } from './text';

export const skillBody = z.object({
  name: z
    .string()
    .trim()
    .min(1, 'Enter a name')
    .max(80, 'At most 80 characters')
    .refine(noControl, CONTROL_MESSAGE)
    // CSV files list a person's skills separated by ';' (server/people/import.ts).
    .refine((n) => !n.includes(';'), "A skill name cannot contain ';' (CSV files use it between skills)"),
});

const personFields = {
  name: lineText(120),
  email: z.string().trim().max(254).email('This is not an e-mail address').nullable().optional(),
  contractedHours: z.number({ error: 'Enter the hours as a number' }).min(0, 'Hours cannot be negative').max(168, 'A week has 168 hours'),
  skillIds: z.array(z.number().int().min(1)).max(200).default([]),
};
export const createPersonBody = z.object(personFields);
export const updatePersonBody = z.object({ ...personFields, version: versionField }).partial().required({ version: true });
export const peopleListQuery = listQuerySchema(['name', 'contractedHours', 'createdAt'] as const, 'name').extend({
  /** Only people holding this skill. */
  skillId: z.coerce.number().int().min(1).optional(),
  /** `true`: only archived people (to restore one); otherwise only people still in use. */
  archived: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
});
/** `?archive=false` refuses to archive: the delete either removes the person or answers 409. */
export const deletePersonQuery = z.object({
  archive: z.enum(['true', 'false']).default('true').transform((v) => v === 'true'),
});
export const restorePersonBody = z.object({ version: versionField });
export type PeopleListQuery = z.input<typeof peopleListQuery>;

export interface PersonDto {
  id: number;
  name: string;
  email: string | null;
  contractedHours: number;
  skillIds: number[];
  userId: number | null;
  version: number;
  createdAt: string;
  /** When the person was archived (deleted after being rostered); null while in use. */
  archivedAt: string | null;
}
/** What DELETE /api/people/:id did: removed the row, or archived a person who is in roster history. */
export interface DeletePersonAnswer {
  outcome: 'deleted' | 'archived';
  person?: PersonDto;
  /** The rosters (solved or published) that keep the person's name. */
  rosters?: Array<{ id: number; name: string; status: string }>;
}
export interface SkillDto {
  id: number;
  name: string;
  /** How many people of the workspace hold it. */
  people?: number;
}

// ---- CSV import and export (server/people/import.ts, export.ts) ----

/** The columns of a people CSV file, in the order the export writes them. */
export const PEOPLE_CSV_COLUMNS = ['name', 'email', 'contracted_hours', 'skills'] as const;
export const PEOPLE_CSV_REQUIRED = ['name', 'contracted_hours'] as const;
export const IMPORT_MAX_BYTES = 5 * 1024 * 1024;
export const IMPORT_MAX_ROWS = 5000;

export type ImportAction = 'create' | 'update' | 'unchanged' | 'error';

export interface ImportRowError {
  /** The row as a spreadsheet shows it: the header is row 1, the first person row 2. */
  row: number;
  column?: string;
  message: string;
}

export interface ImportRow {
  row: number;
  action: ImportAction;
  name: string;
  email: string | null;
  contractedHours: number | null;
  skills: string[];
  /** The existing person an update applies to. */
  personId?: number;
  /** For updates: which fields change, in words. */
  changes?: string[];
}

export interface ImportReport {
  fileName: string;
  delimiter: ',' | ';' | '\t';
  columns: string[];
  rows: number;
  counts: Record<ImportAction, number>;
  errors: ImportRowError[];
  items: ImportRow[];
  canCommit: boolean;
  /** Set once the import was committed. */
  committed?: boolean;
}
