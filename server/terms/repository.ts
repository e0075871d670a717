import { Person } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { updateVersioned } from '../http/versioned';
import { describeTerm, type TermDto } from '../../shared/api/terms';
import type { Term } from '../../shared/roster/schema';
import { PersonTermRow } from './models';

function toDto(r: PersonTermRow): TermDto {
  // `from` is the roster's business (set from effectiveFrom at assembly), not the stored term's
  const { from: _from, ...term } = r.term as Term & { from?: string };
  return { id: r.id, personId: r.personId, term: term as Term, effectiveFrom: r.effectiveFrom, words: describeTerm(term as Term), version: r.version, createdAt: new Date(r.createdAt).toISOString() };
}

async function requirePerson(workspaceId: number, personId: number): Promise<void> {
  const p = await Person.findOne({ where: { id: personId, workspaceId }, attributes: ['id'] });
  if (!p) throw notFound('Person');
}

export async function listTerms(workspaceId: number, personId: number): Promise<TermDto[]> {
  await requirePerson(workspaceId, personId);
  const rows = await PersonTermRow.findAll({ where: { workspaceId, personId }, order: [['effectiveFrom', 'ASC'], ['id', 'ASC']] });
  return rows.map(toDto);
}

const MAX_TERMS_PER_PERSON = 50;

export async function createTerm(workspaceId: number, personId: number, body: { term: Term; effectiveFrom: string }): Promise<TermDto> {
  await requirePerson(workspaceId, personId);
  // the roster format caps terms per person at 50; refuse here rather than at solve time
  const count = await PersonTermRow.count({ where: { workspaceId, personId } });
  if (count >= MAX_TERMS_PER_PERSON) throw new HttpError(409, 'conflict', `A person can have at most ${MAX_TERMS_PER_PERSON} terms; remove one first`, [{ path: 'body.term', message: 'too many terms' }]);
  const { from: _from, ...term } = body.term as Term & { from?: string };
  const row = await PersonTermRow.create({ workspaceId, personId, term: term as Term, effectiveFrom: body.effectiveFrom });
  return toDto(row);
}

export async function updateTerm(workspaceId: number, personId: number, id: number, body: { term?: Term; effectiveFrom?: string; version: number }): Promise<TermDto> {
  await requirePerson(workspaceId, personId);
  const changes: Record<string, unknown> = {};
  if (body.term) {
    const { from: _from, ...term } = body.term as Term & { from?: string };
    changes.term = term;
  }
  if (body.effectiveFrom) changes.effectiveFrom = body.effectiveFrom;
  await updateVersioned(PersonTermRow, { id, workspaceId, personId }, body.version, changes, 'Term');
  const row = await PersonTermRow.findOne({ where: { id, workspaceId, personId } });
  if (!row) throw notFound('Term');
  return toDto(row);
}

export async function deleteTerm(workspaceId: number, personId: number, id: number): Promise<void> {
  await requirePerson(workspaceId, personId);
  const n = await PersonTermRow.destroy({ where: { id, workspaceId, personId } });
  if (n === 0) throw notFound('Term');
}

/**
 * The terms of every person that apply to a roster period, in the roster format: every term
 * effective on or before the last day; one effective after the first day covers shifts from then.
 */
export async function termsForPeriod(workspaceId: number, period: { start: string; end: string }): Promise<Map<number, Term[]>> {
  const rows = await PersonTermRow.findAll({ where: { workspaceId }, order: [['personId', 'ASC'], ['effectiveFrom', 'ASC'], ['id', 'ASC']] });
  const out = new Map<number, Term[]>();
  for (const r of rows) {
    if (r.effectiveFrom > period.end) continue;
    const { from: _from, ...term } = r.term as Term & { from?: string };
    const list = out.get(r.personId) ?? [];
    list.push({ ...(term as Term), ...(r.effectiveFrom > period.start ? { from: r.effectiveFrom } : {}) });
    out.set(r.personId, list);
  }
  return out;
}
