/**
 * Cautions a weight suggestion carries beside its figures: when it explains the edits no better
 * than the weights already set, and when it lowers rules that protect people or staffing (a lower
 * weight lets the solver give more of them up). Pure, from the suggestion's own numbers.
 */
import type { WeightChange } from '../../shared/api/suggestion';
import { RULE_WORDS } from '../../solver/roster/rules/catalogue-words';

/** Rules whose concessions leave a shift short-handed (beside the working-time rules, which the catalogue marks). */
const STAFFING_RULES = new Set(['coverage', 'skillMix']);

const isProtective = (key: string) => STAFFING_RULES.has(key) || (RULE_WORDS as Record<string, { workingTime?: boolean }>)[key]?.workingTime === true;

const list = (names: string[]) => (names.length <= 1 ? names.join('') : `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`);

export function suggestionCautions(changes: WeightChange[], agree: { before: number; after: number; of: number }): string[] {
  const out: string[] = [];
  if (changes.length > 0 && agree.after <= agree.before) {
    out.push(
      `The suggested weights agree with ${agree.after} of ${agree.of} edits, no more than the current ones (${agree.before}): adopting them is unlikely to bring the solver's rosters closer to your own.`,
    );
  }
  const lowered = changes.filter((c) => c.to < c.from && isProtective(c.key));
  if (lowered.length > 0) {
    const names = lowered.map((c) => c.name);
    out.push(
      `Lower weights on ${list(names)} let the solver give more of ${lowered.length === 1 ? 'it' : 'them'} up (open seats, missing skills, less rest or longer hours). Check the rosters against local law, agreements and licensed practice before adopting.`,
    );
  }
  return out;
}
