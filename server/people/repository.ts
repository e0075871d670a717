import { ForeignKeyConstraintError, Op, QueryTypes, Sequelize, UniqueConstraintError, type Transaction, type WhereOptions } from 'sequelize';
import { Person, Skill } from '../db/models';
import { transactionWithRetry } from '../db/sequelize';
import { HttpError, notFound } from '../http/errors';
import { updateVersioned } from '../http/versioned';
import type { Page } from '../../shared/api/paging';
import type { DeletePersonAnswer, PersonDto, SkillDto } from '../../shared/api/people';

export const toPersonDto = (p: Person): PersonDto => ({
  id: p.id,
  name: p.name,
  email: p.email ?? null,
  contractedHours: p.contractedHours,
  skillIds: p.skills ?? [],
  userId: p.userId ?? null,
  version: p.version,
  createdAt: new Date(p.createdAt).toISOString(),
  archivedAt: p.archivedAt ? new Date(p.archivedAt).toISOString() : null,
});

export async function listSkills(workspaceId: number): Promise<SkillDto[]> {
  const [rows, people] = await Promise.all([
    Skill.findAll({ where: { workspaceId }, order: [['name', 'ASC']] }),
    Person.findAll({ where: { workspaceId, archivedAt: null }, attributes: ['skills'] }),
  ]);
  const holders = new Map<number, number>();
  for (const p of people) for (const id of p.skills ?? []) holders.set(id, (holders.get(id) ?? 0) + 1);
  return rows.map((s) => ({ id: s.id, name: s.name, people: holders.get(s.id) ?? 0 }));
}

export async function createSkill(workspaceId: number, name: string): Promise<SkillDto> {
  try {
    const s = await Skill.create({ workspaceId, name });
    return { id: s.id, name: s.name };
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new HttpError(409, 'conflict', `There is already a skill called "${name}"`, [{ path: 'body.name', message: 'already exists' }]);
    throw err;
  }
}

export async function renameSkill(workspaceId: number, id: number, name: string): Promise<SkillDto> {
  const s = await Skill.findOne({ where: { id, workspaceId } });
  if (!s) throw notFound('Skill');
  s.name = name;
  try {
    await s.save();
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw new HttpError(409, 'conflict', `There is already a skill called "${name}"`, [{ path: 'body.name', message: 'already exists' }]);
    throw err;
  }
  return { id: s.id, name: s.name };
}

/** Deleting a skill also takes it off everyone who held it (their version moves on), in one transaction. */
export async function deleteSkill(workspaceId: number, id: number): Promise<void> {
  await Skill.sequelize!.transaction(async (transaction) => {
    const count = await Skill.destroy({ where: { id, workspaceId }, transaction });
    if (count === 0) throw notFound('Skill');
    const holders = await Person.findAll({ where: { workspaceId }, transaction, lock: transaction.LOCK.UPDATE });
    for (const p of holders) {
      if (!(p.skills ?? []).includes(id)) continue;
      await Person.update({ skills: p.skills.filter((s) => s !== id), version: p.version + 1 }, { where: { id: p.id, workspaceId }, transaction });
    }
  });
}

/** Skill ids must belong to the same workspace; anything else is named as the field at fault. */
export async function checkSkillIds(workspaceId: number, skillIds: number[]): Promise<void> {
  if (skillIds.length === 0) return;
  const found = await Skill.findAll({ where: { workspaceId, id: skillIds }, attributes: ['id'] });
  const known = new Set(found.map((s) => s.id));
  const bad = skillIds.findIndex((id) => !known.has(id));
  if (bad >= 0) throw new HttpError(422, 'unprocessable', `Unknown skill id ${skillIds[bad]}`, [{ path: `body.skillIds.${bad}`, message: 'unknown skill' }]);
}

export async function listPeople(
  workspaceId: number,
  query: { page: number; pageSize: number; sort: 'name' | 'contractedHours' | 'createdAt'; order: 'asc' | 'desc'; q?: string; skillId?: number; archived?: boolean },
): Promise<Page<PersonDto>> {
  const like = query.q ? `%${query.q.trim().replace(/[%_\\]/g, '\\$&')}%` : null;
  const where: WhereOptions = {
    workspaceId,
    archivedAt: query.archived ? { [Op.ne]: null } : null,
    ...(like ? { [Op.or]: [{ name: { [Op.like]: like } }, { email: { [Op.like]: like } }] } : {}),
    // skills is a JSON array of ids; JSON_CONTAINS matches the number exactly.
    ...(query.skillId ? { [Op.and]: [Sequelize.where(Sequelize.fn('JSON_CONTAINS', Sequelize.col('skills'), String(query.skillId)), 1)] } : {}),
  };
  const { rows, count } = await Person.findAndCountAll({
    where,
    order: [[query.sort, query.order.toUpperCase()], ['id', 'ASC']],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  });
  return { items: rows.map(toPersonDto), total: count, page: query.page, pageSize: query.pageSize };
}

export async function getPerson(workspaceId: number, id: number): Promise<PersonDto> {
  const p = await Person.findOne({ where: { id, workspaceId } });
  if (!p) throw notFound('Person');
  return toPersonDto(p);
}

export async function createPerson(workspaceId: number, body: { name: string; email?: string | null; contractedHours: number; skillIds: number[] }): Promise<PersonDto> {
  await checkSkillIds(workspaceId, body.skillIds);
  const p = await Person.create({ workspaceId, name: body.name, email: body.email ?? null, contractedHours: body.contractedHours, skills: body.skillIds });
  return toPersonDto(p);
}

export async function updatePerson(
  workspaceId: number,
  id: number,
  body: { version: number; name?: string; email?: string | null; contractedHours?: number; skillIds?: number[] },
): Promise<PersonDto> {
  if (body.skillIds) await checkSkillIds(workspaceId, body.skillIds);
  const changes: Record<string, unknown> = {};
  if (body.name !== undefined) changes.name = body.name;
  if (body.email !== undefined) changes.email = body.email;
  if (body.contractedHours !== undefined) changes.contractedHours = body.contractedHours;
  if (body.skillIds !== undefined) changes.skills = body.skillIds;
  await updateVersioned(Person, { id, workspaceId }, body.version, changes, 'Person');
  return getPerson(workspaceId, id);
}

/** The rosters whose runs (solved, published or earlier) have this person in a seat. */
export async function rostersHolding(workspaceId: number, personId: number, transaction?: Transaction): Promise<Array<{ id: number; name: string; status: string }>> {
  return Person.sequelize!.query<{ id: number; name: string; status: string }>(
    `SELECT DISTINCT r.id, r.name, r.status FROM assignments a
       JOIN runs ru ON ru.id = a.run_id AND ru.workspace_id = a.workspace_id
       JOIN rosters r ON r.id = ru.roster_id AND r.workspace_id = ru.workspace_id
      WHERE a.workspace_id = ? AND a.person_id = ? ORDER BY r.id`,
    { replacements: [workspaceId, personId], type: QueryTypes.SELECT, transaction },
  );
}

/**
 * Deleting a person who is in roster history (a run's seats, or records other tables keep with
 * RESTRICT such as absences) archives them instead, unless `archive` is false, when it is a 409
 * naming the rosters: solved and published rosters must keep showing who worked. A person never
 * rostered is removed. Archived people drop out of lists, pickers, exports and new rosters.
 */
export async function deletePerson(workspaceId: number, id: number, options: { archive: boolean } = { archive: true }): Promise<DeletePersonAnswer> {
  return transactionWithRetry(Person.sequelize!, async (transaction) => {
    // Locked, so a run saving this person's seats meanwhile either waits or makes the delete fail on RESTRICT.
    const p = await Person.findOne({ where: { id, workspaceId }, transaction, lock: transaction.LOCK.UPDATE });
    if (!p) throw notFound('Person');
    const rosters = await rostersHolding(workspaceId, id, transaction);
    let blockedBy = rosters.length > 0 ? 'roster' : null;
    if (!blockedBy) {
      try {
        await p.destroy({ transaction });
        return { outcome: 'deleted' as const };
      } catch (err) {
        // A RESTRICT reference we do not list by name (absences, terms, a run saved meanwhile).
        if (!(err instanceof ForeignKeyConstraintError)) throw err;
        blockedBy = 'records';
      }
    }
    const named = rosters.map((r) => `"${r.name}"`).join(', ');
    if (!options.archive) {
      throw new HttpError(
        409,
        'conflict',
        blockedBy === 'roster'
          ? `${p.name} is on ${rosters.length === 1 ? 'the roster' : 'the rosters'} ${named}; deleting would change ${rosters.length === 1 ? 'it' : 'them'}. Archive ${p.name} instead (hidden from lists, kept in history).`
          : `${p.name} has records that are kept (absences, terms or runs); archive ${p.name} instead.`,
        [{ path: 'query.archive', message: blockedBy === 'roster' ? `on rosters ${rosters.map((r) => r.id).join(', ')}` : 'has kept records' }],
      );
    }
    if (!p.archivedAt) await p.update({ archivedAt: new Date(), version: p.version + 1 }, { transaction });
    return { outcome: 'archived' as const, person: toPersonDto(p), rosters };
  });
}

/** Brings an archived person back into lists and new rosters. */
export async function restorePerson(workspaceId: number, id: number, version: number): Promise<PersonDto> {
  const p = await Person.findOne({ where: { id, workspaceId } });
  if (!p) throw notFound('Person');
  if (!p.archivedAt) throw new HttpError(409, 'conflict', `${p.name} is not archived`, [{ path: 'params.id', message: 'not archived' }]);
  await updateVersioned(Person, { id, workspaceId }, version, { archivedAt: null }, 'Person');
  return getPerson(workspaceId, id);
}

/** A person who can be put on a roster, paired or given wishes now: of this workspace and not archived. */
export async function activePerson(workspaceId: number, id: number, transaction?: Transaction): Promise<Person | null> {
  return Person.findOne({ where: { id, workspaceId, archivedAt: null }, transaction });
}

/** A person of the workspace by id, archived or not (the person a member is linked to); null when there is none. */
export async function findPerson(workspaceId: number, id: number): Promise<Person | null> {
  return Person.findOne({ where: { id, workspaceId } });
}
