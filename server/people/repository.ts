import { Op, Sequelize, UniqueConstraintError, type WhereOptions } from 'sequelize';
import { Person, Skill } from '../db/models';
import { HttpError, notFound } from '../http/errors';
import { updateVersioned } from '../http/versioned';
import type { Page } from '../../shared/api/paging';
import type { PersonDto, SkillDto } from '../../shared/api/people';

export const toPersonDto = (p: Person): PersonDto => ({
  id: p.id,
  name: p.name,
  email: p.email ?? null,
  contractedHours: p.contractedHours,
  skillIds: p.skills ?? [],
  userId: p.userId ?? null,
  version: p.version,
  createdAt: new Date(p.createdAt).toISOString(),
});

export async function listSkills(workspaceId: number): Promise<SkillDto[]> {
  const [rows, people] = await Promise.all([
    Skill.findAll({ where: { workspaceId }, order: [['name', 'ASC']] }),
    Person.findAll({ where: { workspaceId }, attributes: ['skills'] }),
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
  query: { page: number; pageSize: number; sort: 'name' | 'contractedHours' | 'createdAt'; order: 'asc' | 'desc'; q?: string; skillId?: number },
): Promise<Page<PersonDto>> {
  const like = query.q ? `%${query.q.trim().replace(/[%_\\]/g, '\\$&')}%` : null;
  const where: WhereOptions = {
    workspaceId,
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

export async function deletePerson(workspaceId: number, id: number): Promise<void> {
  const count = await Person.destroy({ where: { id, workspaceId } });
  if (count === 0) throw notFound('Person');
}
