import { Op, UniqueConstraintError } from 'sequelize';
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
});

export async function listSkills(workspaceId: number): Promise<SkillDto[]> {
  const rows = await Skill.findAll({ where: { workspaceId }, order: [['name', 'ASC']] });
  return rows.map((s) => ({ id: s.id, name: s.name }));
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
  await s.save();
  return { id: s.id, name: s.name };
}

export async function deleteSkill(workspaceId: number, id: number): Promise<void> {
  const count = await Skill.destroy({ where: { id, workspaceId } });
  if (count === 0) throw notFound('Skill');
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
  query: { page: number; pageSize: number; sort: 'name' | 'contractedHours' | 'createdAt'; order: 'asc' | 'desc'; q?: string },
): Promise<Page<PersonDto>> {
  const where = { workspaceId, ...(query.q ? { name: { [Op.like]: `%${query.q.replace(/[%_\\]/g, '\\$&')}%` } } : {}) };
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
