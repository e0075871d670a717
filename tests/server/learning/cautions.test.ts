import { describe, expect, it } from 'vitest';
import { suggestionCautions } from '../../../server/learning/cautions';
import type { WeightChange } from '../../../shared/api/suggestion';

const change = (key: string, name: string, from: number, to: number): WeightChange => ({ key, name, from, to });

/**
 * Which suggestions carry a caution. Daily and weekly rest are working-time rules of Directive
 * 2003/88/EC (Art. 3, Art. 5); open seats and missing skills leave a shift short-handed (common
 * practice, no source). Raising such a weight, or lowering a preference like fair weekends, is no
 * cause for one.
 */
describe('suggestion cautions', () => {
  const agreeMore = { before: 2, after: 6, of: 9 };

  it('cautions when a lowered weight protects rest (Directive 2003/88/EC Art. 3) or staffing, and names them', () => {
    const out = suggestionCautions([change('minRest', 'daily rest', 20, 5), change('coverage', 'every seat filled', 100, 40), change('fairWeekends', 'fair share of weekends', 3, 1)], agreeMore);
    expect(out).toHaveLength(1);
    expect(out[0]).toMatch(/^Lower weights on daily rest and every seat filled let the solver give more of them up .*local law, agreements and licensed practice/);
    expect(out[0]).not.toMatch(/weekends/);
  });

  it('says nothing when protective weights only go up and the suggestion explains more edits', () => {
    expect(suggestionCautions([change('weeklyRest', 'weekly rest', 20, 30), change('fairWeekends', 'fair share of weekends', 3, 1)], agreeMore)).toEqual([]);
  });

  it('says so when the suggested weights agree with no more edits than the current ones', () => {
    const out = suggestionCautions([change('fairNights', 'fair share of nights', 3, 3.5)], { before: 2, after: 2, of: 9 });
    expect(out).toEqual(["The suggested weights agree with 2 of 9 edits, no more than the current ones (2): adopting them is unlikely to bring the solver's rosters closer to your own."]);
    // nothing to adopt, nothing to caution
    expect(suggestionCautions([], { before: 2, after: 2, of: 9 })).toEqual([]);
  });
});
