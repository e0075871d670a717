import { Person, Skill } from '../db/models';
import { PEOPLE_CSV_COLUMNS } from '../../shared/api/people';
import { buildCsv } from '../exports/csv';

/** The workspace's people in the import's columns, sorted by name, as UTF-8 with a byte order mark (spreadsheet programs need it to read accents). */
export async function exportPeopleCsv(workspaceId: number): Promise<string> {
  const [people, skills] = await Promise.all([
    Person.findAll({ where: { workspaceId, archivedAt: null }, order: [['name', 'ASC'], ['id', 'ASC']] }),
    Skill.findAll({ where: { workspaceId } }),
  ]);
  const skillName = new Map(skills.map((s) => [s.id, s.name]));
  const rows = people.map((p) => {
    const names = (p.skills ?? []).map((id) => skillName.get(id)).filter((n): n is string => Boolean(n));
    return [p.name, p.email ?? '', String(p.contractedHours), names.join(';')];
  });
  return buildCsv([[...PEOPLE_CSV_COLUMNS], ...rows], { bom: true });
}
