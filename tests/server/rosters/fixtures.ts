import type { Workspace } from '../../../server/db/models';
import { Skill } from '../../../server/db/models';
import type { agent as makeAgent } from '../auth/helpers';

type Agent = ReturnType<typeof makeAgent>;
let fixtureCount = 0;

/**
 * A small roster through the API, as a coordinator would build it: skills, people, a roster and
 * one or more shift patterns. Overrides change the period or the patterns.
 */
export async function makeApiRoster(
  coordinator: Agent,
  workspace: Workspace,
  overrides: { people?: number; periodStart?: string; periodEnd?: string; patterns?: Array<Record<string, unknown>> } = {},
) {
  const firstAid = await Skill.create({ workspaceId: workspace.id, name: `First aid ${++fixtureCount}` });
  const people = [];
  for (let i = 0; i < (overrides.people ?? 6); i++) {
    const res = await coordinator.post('/api/people').send({ name: `Person ${String.fromCharCode(65 + i)}`, contractedHours: 30, skillIds: i % 2 === 0 ? [firstAid.id] : [] });
    if (res.status !== 201) throw new Error(`person: ${res.status} ${JSON.stringify(res.body)}`);
    people.push(res.body);
  }
  const roster = await coordinator.post('/api/rosters').send({
    name: 'Test roster',
    periodStart: overrides.periodStart ?? '2027-03-01',
    periodEnd: overrides.periodEnd ?? '2027-03-07',
    timeZone: 'Europe/London',
  });
  if (roster.status !== 201) throw new Error(`roster: ${roster.status} ${JSON.stringify(roster.body)}`);
  for (const pattern of overrides.patterns ?? [
    { label: 'early', weekdays: ['mon', 'tue', 'wed', 'thu', 'fri'], startTime: '07:00', endTime: '15:00', seats: [{ skillId: firstAid.id, count: 1 }, { skillId: null, count: 1 }] },
  ]) {
    const res = await coordinator.post(`/api/rosters/${roster.body.id}/patterns`).send(pattern);
    if (res.status !== 201) throw new Error(`pattern: ${res.status} ${JSON.stringify(res.body)}`);
  }
  return { roster: roster.body as { id: number; version: number }, people: people as Array<{ id: number; version: number; name: string }>, firstAid };
}
