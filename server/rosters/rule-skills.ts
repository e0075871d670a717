import { Skill } from '../db/models';
import { HttpError, type FieldError } from '../http/errors';
import type { RuleSet } from '../../shared/roster/schema';

const SKILL_ID = /^s(\d{1,10})$/;

/**
 * Rules name skills as the assembled roster does (s<id>). One that names no skill of this
 * workspace (unknown, deleted, another workspace's, not an id at all) would be stored and then
 * make every run start fail, so the save is refused, naming each requirement at fault.
 */
export async function requireWorkspaceSkills(workspaceId: number, rules: RuleSet): Promise<void> {
  const requirements = rules.skillMix.requirements;
  if (!requirements.length) return;
  const wanted = [...new Set(requirements.map((q) => SKILL_ID.exec(q.skill)?.[1]).filter((n): n is string => n !== undefined).map(Number))];
  const found = wanted.length ? await Skill.findAll({ where: { workspaceId, id: wanted }, attributes: ['id'] }) : [];
  const known = new Set(found.map((s) => `s${s.id}`));
  const fields: FieldError[] = requirements.flatMap((q, i) =>
    known.has(q.skill) ? [] : [{ path: `body.rules.skillMix.requirements.${i}.skill`, message: 'No such skill in this workspace' }],
  );
  if (fields.length) throw new HttpError(400, 'validation_failed', 'A skill-mix requirement names a skill this workspace does not have', fields);
}
