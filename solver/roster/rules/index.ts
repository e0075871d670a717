/**
 * The rule catalogue in display order: every roster-wide rule and every per-person term kind
 * is one module here. compileRoster runs each `compile`, scoreRoster each `check`; the plain
 * words (for the client and docs) are in catalogue-words.ts.
 */
import type { RuleName, TermKind } from '../../../shared/roster/schema';
import { RULE_NAMES } from '../../../shared/roster/schema';
import type { RuleModule, TermModule } from './types';
import { coverage } from './coverage';
import { minRest } from './min-rest';
import { weeklyRest } from './weekly-rest';
import { averageWeeklyHours } from './average-weekly-hours';
import { nightAverage } from './night-average';
import { shiftsPerWindow } from './shifts-per-window';
import { maxHoursPer7Days } from './max-hours-per-7-days';
import { nightShiftLength } from './night-shift-length';
import { maxConsecutiveDays } from './max-consecutive-days';
import { maxNightsInRow } from './max-nights-in-row';
import { contractedHours } from './contracted-hours';
import { fairNights, fairWeekends } from './fair';
import { skillMix } from './skill-mix';
import { noNights } from './terms/no-nights';
import { daysOff } from './terms/days-off';
import { earliestStart } from './terms/earliest-start';
import { latestEnd } from './terms/latest-end';
import { allowedPatterns } from './terms/allowed-patterns';
import { maxHours, minHours } from './terms/hours';
import { maxNights } from './terms/max-nights';
import { maxShiftsPerWeek } from './terms/max-shifts-per-week';
import { maxWeekends } from './terms/max-weekends';

const byId: { [K in RuleName]: RuleModule<K> } = {
  coverage,
  minRest,
  weeklyRest,
  averageWeeklyHours,
  nightAverage,
  shiftsPerWindow,
  maxHoursPer7Days,
  nightShiftLength,
  maxConsecutiveDays,
  maxNightsInRow,
  contractedHours,
  fairNights,
  fairWeekends,
  skillMix,
};

/** Roster-wide rules in display order (RULE_NAMES). */
export const RULES: RuleModule[] = RULE_NAMES.map((id) => byId[id] as unknown as RuleModule);
export const RULE_MODULES = byId;

export const TERMS: { [K in TermKind]: TermModule<K> } = {
  minHours,
  maxHours,
  noNights,
  maxNights,
  maxWeekends,
  daysOff,
  maxShiftsPerWeek,
  earliestStart,
  latestEnd,
  allowedPatterns,
};

export { RULE_CATALOGUE, TERM_CATALOGUE, RULE_WORDS, TERM_WORDS, rulesTableMarkdown, termsTableMarkdown } from './catalogue-words';
export type { RuleModule, TermModule } from './types';
