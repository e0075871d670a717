import { Person, Skill } from '../db/models';
import { PEOPLE_CSV_COLUMNS } from '../../shared/api/people';

/**
 * One CSV cell (RFC 4180, section 2): quoted when it holds a comma, a quote or a line break,
 * with quotes doubled. A cell a spreadsheet would run as a formula (=, +, -, @ first) gets a
 * leading apostrophe (OWASP "CSV injection"); the import takes it off again.
 */
export function csvCell(value: string): string {
  const guarded = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  return /[",\r\n;]/.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded;
}

/** RFC 4180 lines end in CRLF. */
export const csvLine = (cells: string[]) => `${cells.map(csvCell).join(',')}\r\n`;

/** The workspace's people in the import's columns, sorted by name, as UTF-8 with a byte order mark (spreadsheet programs need it to read accents). */
export async function exportPeopleCsv(workspaceId: number): Promise<string> {
  const [people, skills] = await Promise.all([
    Person.findAll({ where: { workspaceId, archivedAt: null }, order: [['name', 'ASC'], ['id', 'ASC']] }),
    Skill.findAll({ where: { workspaceId } }),
  ]);
  const skillName = new Map(skills.map((s) => [s.id, s.name]));
  let out = `\uFEFF${csvLine([...PEOPLE_CSV_COLUMNS])}`;
  for (const p of people) {
    const names = (p.skills ?? []).map((id) => skillName.get(id)).filter((n): n is string => Boolean(n));
    out += csvLine([p.name, p.email ?? '', String(p.contractedHours), names.join(';')]);
  }
  return out;
}
