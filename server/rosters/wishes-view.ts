import { Person, User } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { WishRow } from './models';
import { findRoster, touchRoster, changeRoster } from './repository';
import type { CoordinatorWishDto, WishesViewDto } from '../../shared/api/rosters';

const toDto = (w: WishRow, names: Map<number, string>): CoordinatorWishDto => ({
  id: w.id,
  personId: w.personId,
  date: w.date ?? null,
  shiftId: w.shiftId ?? null,
  kind: w.kind,
  strength: w.strength,
  note: w.note ?? null,
  enteredByName: w.enteredByUserId ? (names.get(w.enteredByUserId) ?? null) : null,
  createdAt: new Date(w.createdAt).toISOString(),
  updatedAt: new Date(w.updatedAt).toISOString(),
});

async function enteredByNames(rows: WishRow[]): Promise<Map<number, string>> {
  const ids = [...new Set(rows.map((w) => w.enteredByUserId).filter((id): id is number => !!id))];
  const users = ids.length ? await User.findAll({ where: { id: ids }, attributes: ['id', 'displayName'] }) : [];
  return new Map(users.map((u) => [u.id, u.displayName]));
}

/**
 * The coordinator's wishes view of a roster: every wish with who entered it and when, and the
 * people who have stated none yet (so the coordinator can ask them, or enter theirs).
 */
export async function wishesView(workspaceId: number, rosterId: number): Promise<WishesViewDto> {
  await findRoster(workspaceId, rosterId);
  const [rows, people] = await Promise.all([
    WishRow.findAll({ where: { workspaceId, rosterId }, order: [['id', 'ASC']] }),
    Person.findAll({ where: { workspaceId }, attributes: ['id', 'name', 'userId'], order: [['name', 'ASC'], ['id', 'ASC']] }),
  ]);
  const names = await enteredByNames(rows);
  const stated = new Set(rows.map((w) => w.personId));
  return {
    items: rows.map((w) => toDto(w, names)),
    silent: people.filter((p) => !stated.has(p.id)).map((p) => ({ personId: p.id, name: p.name, hasLogin: p.userId !== null && p.userId !== undefined })),
  };
}

/** A coordinator changes a wish (any person's, also after the staff deadline: late wishes go through them). */
export async function updateWish(
  workspaceId: number,
  rosterId: number,
  id: number,
  body: { kind?: 'prefer' | 'avoid' | 'cannot'; strength?: number; note?: string | null },
  enteredByUserId: number,
): Promise<CoordinatorWishDto> {
  const roster = await findRoster(workspaceId, rosterId);
  if (roster.status === 'published') throw new HttpError(409, 'conflict', `${roster.name} is published; reopen it to change wishes`, [{ path: 'params.rosterId', message: 'roster is published' }]);
  const w = await WishRow.findOne({ where: { id, workspaceId, rosterId } });
  if (!w) throw notFound('Wish');
  if (body.kind !== undefined) w.kind = body.kind;
  if (body.strength !== undefined) w.strength = body.strength;
  if (body.note !== undefined) w.note = body.note?.trim() ? body.note.trim() : null;
  w.enteredByUserId = enteredByUserId;
  await changeRoster(workspaceId, rosterId, async (transaction) => {
    await w.save({ transaction });
    await touchRoster(workspaceId, rosterId, transaction);
  });
  return toDto(w, await enteredByNames([w]));
}
