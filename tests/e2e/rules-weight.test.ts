import { describe, expect, it } from 'vitest';
import { openPage, screenshot, useBrowser, WIDE } from './helpers/browser';
import { api, solveThroughApi } from './helpers/api';
import { signUpThroughMail } from './helpers/sign-up';
import { RULE_NAMES, rosterSchema } from '../../shared/roster/schema';
import { compileRoster } from '../../solver/roster/compile';

type Rules = Record<string, { enabled: boolean; hard: boolean; weight: number }>;

/**
 * A weight typed on the rules form reaches the model and changes the result. One person, a late
 * ending 22:30 and an early at 07:00 the next day: 8.5 h of rest, short of Directive 2003/88/EC
 * Art. 3's 11 h. With only coverage (100 points an open seat, the default) and a soft minimum rest
 * on, the best roster works both shifts while the rest breach costs less than an open seat, and
 * leaves one seat open once it costs more (worked by hand: -20 vs -100, then -150 vs -100).
 */
describe('the rules form changes a weight the solver uses', () => {
  const browser = useBrowser();

  it('a minimum-rest weight raised on the form shows in the compiled factor and turns the result from a short rest into an open seat', { timeout: 240_000 }, async () => {
    const { page, problems, close } = await openPage(browser(), WIDE);
    const shot = (name: string) => screenshot(page, `rules-weight-${name}`);
    await signUpThroughMail(page, { displayName: 'Tamsin Oakridge', email: `weights.${Date.now().toString(36)}@example.test`, password: 'a long enough test password', workspaceName: 'Oakridge Weights House', timeZone: 'Europe/London' });
    const person = await api<{ id: number }>(page, 'POST', '/people', { name: 'Solo Nightingale', contractedHours: 40, skillIds: [] });
    const roster = await api<{ id: number }>(page, 'POST', '/rosters', { name: 'Weights roster', periodStart: '2027-01-04', periodEnd: '2027-01-10', timeZone: 'Europe/London' });
    await api(page, 'POST', `/rosters/${roster.id}/shifts`, { label: 'late', startsLocal: '2027-01-04T14:30', endsLocal: '2027-01-04T22:30', seats: [{ skillId: null }] });
    await api(page, 'POST', `/rosters/${roster.id}/shifts`, { label: 'early', startsLocal: '2027-01-05T07:00', endsLocal: '2027-01-05T15:00', seats: [{ skillId: null }] });
    const current = await api<{ rules: Rules; version: number }>(page, 'GET', `/rosters/${roster.id}/rules`);
    const only = Object.fromEntries(RULE_NAMES.map((id) => [id, { ...current.rules[id], enabled: id === 'coverage' || id === 'minRest' }]));
    await api(page, 'PUT', `/rosters/${roster.id}/rules`, { version: current.version, rules: { ...only, coverage: { ...only.coverage, hard: false, weight: 100 }, minRest: { ...only.minRest, hard: false, weight: 20 } } });

    /** The minimum-rest factor of the roster a run would solve now, compiled by the solver. */
    const restFactor = async () => {
      const compiled = compileRoster(rosterSchema.parse(await api(page, 'GET', `/rosters/${roster.id}/export`)));
      const found = compiled.model.factors.filter((f) => f.id?.startsWith('minRest:'));
      expect(found).toHaveLength(1);
      return found[0]!;
    };
    expect(await restFactor()).toMatchObject({ kind: 'sameKey', weight: -20 });
    const before = await solveThroughApi(page, roster.id);
    expect(before.assignments.map((a) => a.personId)).toEqual([person.id, person.id]);
    expect(before.score).toBe(-20);

    await page.goto(`/rosters/${roster.id}?section=rules`);
    const rest = page.getByTestId('rule-minRest');
    await rest.waitFor();
    const weight = rest.getByLabel(/^Weight/);
    expect(await weight.inputValue()).toBe('20');
    await weight.fill('150');
    await page.getByTestId('rules-save').click();
    await page.getByText('Rules saved. Solve again to apply them.').waitFor();
    await shot('saved');

    expect(await restFactor()).toMatchObject({ kind: 'sameKey', weight: -150 });
    const after = await solveThroughApi(page, roster.id);
    expect(after.assignments.filter((a) => a.personId === null)).toHaveLength(1);
    expect(after.assignments.filter((a) => a.personId === person.id)).toHaveLength(1);
    expect(after.score).toBe(-100);

    expect(problems).toEqual([]);
    await close();
  });
});
