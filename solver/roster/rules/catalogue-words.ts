/**
 * The rule catalogue as plain data: names, one-line descriptions, units, sources, defaults
 * and the parameter fields of every roster-wide rule and per-person term kind. The rules
 * form, the docs table and the rule modules (solver/roster/rules/*.ts) read it. Imports only
 * shared/ code, so client code may import it.
 */
import { ruleSetSchema, TERM_KINDS, type RuleName, type RuleSet, type TermKind } from '../../../shared/roster/schema';
import { WORKING_TIME_CAUTION } from '../../../shared/caution';

export type RuleSource = { kind: 'law'; cite: string } | { kind: 'practice' };

export type ParamField = { name: string; label: string; min: number; max: number; step?: number; optional?: boolean; unit?: string };

export type RuleWords = {
  name: string;
  /** One line: what the rule checks. */
  description: string;
  /** What one unit of a soft breach is (its weight is points per unit). */
  unit: string;
  /** How a breach reads in a concession, as an example. */
  breach: string;
};

export type RuleEntry = RuleWords & {
  id: RuleName;
  source: RuleSource;
  /** "Directive 2003/88/EC, Art. 3" or "common practice, no source". */
  sourceText: string;
  /** Sets or breaks a working-time rule: screens show WORKING_TIME_CAUTION beside it. */
  workingTime: boolean;
  defaults: RuleSet[RuleName];
  fields: ParamField[];
};

export type TermEntry = RuleWords & { kind: TermKind; workingTime: boolean; fields: ParamField[] };

const law = (cite: string): RuleSource => ({ kind: 'law', cite });
const practice: RuleSource = { kind: 'practice' };
export const sourceText = (s: RuleSource) => (s.kind === 'law' ? s.cite : 'common practice, no source');

type Spec = RuleWords & { source: RuleSource; workingTime: boolean; fields: ParamField[] };

export const RULE_WORDS: Record<RuleName, Spec> = {
  coverage: {
    name: 'Every seat filled',
    description: 'Each seat left open costs points; hard: no seat may stay open.',
    unit: 'per open seat',
    breach: 'a Medication round seat on the early shift on Mon 4 Jan is open',
    source: practice,
    workingTime: false,
    fields: [],
  },
  minRest: {
    name: 'Daily rest',
    description: 'At least `hours` between the end of one shift and the start of the next for the same person.',
    unit: 'per pair of shifts too close',
    breach: 'Ada Brook: 8.5 h rest between the late shift on Mon 4 Jan and the early shift on Tue 5 Jan; minimum 11 h',
    source: law('Directive 2003/88/EC, Art. 3'),
    workingTime: true,
    fields: [{ name: 'hours', label: 'Rest of at least (hours)', min: 0, max: 48, step: 0.5 }],
  },
  weeklyRest: {
    name: 'Weekly rest',
    description: 'In every `days` consecutive days, one uninterrupted rest of at least `hours` (24 h plus the 11 h daily rest).',
    unit: 'per window without the rest',
    breach: 'Ada Brook: longest rest 16 h in the 7 days Mon 4 Jan–Sun 10 Jan; needs 35 h',
    source: law('Directive 2003/88/EC, Art. 5, Art. 16(a)'),
    workingTime: true,
    fields: [
      { name: 'days', label: 'In every (days)', min: 2, max: 14 },
      { name: 'hours', label: 'Uninterrupted rest of (hours)', min: 1, max: 168, step: 0.5 },
    ],
  },
  averageWeeklyHours: {
    name: 'Average working week',
    description: 'Hours worked plus credited absence hours average at most `hours` a week over the reference period (the roster period unless `referenceDays` is set; at most 123 days).',
    unit: 'per hour over',
    breach: 'Ada Brook: 200 h in the 28 days Mon 4 Jan–Sun 31 Jan, an average of 50 h a week; at most 48 h (192 h)',
    source: law('Directive 2003/88/EC, Art. 6, Art. 16(b)'),
    workingTime: true,
    fields: [
      { name: 'hours', label: 'Average week of at most (hours)', min: 1, max: 168, step: 0.5 },
      { name: 'referenceDays', label: 'Reference period (days; empty = roster period)', min: 1, max: 123, optional: true },
    ],
  },
  nightAverage: {
    name: 'Night work average',
    description: 'A night worker works at most `hours` on average per 24 h over the reference period, weekly rest days left out.',
    unit: 'per hour over',
    breach: 'Ada Brook (night worker): 200 h in the 28 days Mon 4 Jan–Sun 31 Jan; at most 8 h a day on average over 24 days (192 h)',
    source: law('Directive 2003/88/EC, Art. 8, Art. 16(c)'),
    workingTime: true,
    fields: [
      { name: 'hours', label: 'At most (hours per 24 h, averaged)', min: 1, max: 24, step: 0.5 },
      { name: 'referenceDays', label: 'Reference period (days; empty = roster period)', min: 1, max: 366, optional: true },
    ],
  },
  shiftsPerWindow: {
    name: 'Shifts in a window',
    description: 'Local policy: at most `maxShifts` shifts starting in any `days` consecutive days. Off by default.',
    unit: 'per shift over',
    breach: 'Ada Brook: 7 shifts in the 7 days Mon 4 Jan–Sun 10 Jan; at most 6',
    source: practice,
    workingTime: true,
    fields: [
      { name: 'days', label: 'In any (days)', min: 2, max: 28 },
      { name: 'maxShifts', label: 'At most (shifts)', min: 1, max: 56 },
    ],
  },
  maxHoursPer7Days: {
    name: 'Hours in any 7 days',
    description: 'Local policy, stricter than the Directive’s average: at most `hours` (plus credited absence) in every 7 consecutive days. Off by default.',
    unit: 'per hour over, per 7-day window',
    breach: 'Ada Brook: 56 h in the 7 days Mon 4 Jan–Sun 10 Jan; at most 48 h',
    source: practice,
    workingTime: true,
    fields: [{ name: 'hours', label: 'At most (hours)', min: 1, max: 168, step: 0.5 }],
  },
  nightShiftLength: {
    name: 'Night shift length',
    description: 'Local option, stricter than Art. 8’s average: no night shift longer than `hours`.',
    unit: 'per person working a longer night',
    breach: 'Ada Brook works the night shift on Mon 4 Jan, a 9 h night; at most 8 h',
    source: practice,
    workingTime: true,
    fields: [{ name: 'hours', label: 'Nights of at most (hours)', min: 1, max: 24, step: 0.5 }],
  },
  maxConsecutiveDays: {
    name: 'Consecutive working days',
    description: 'At most `days` days in a row with a shift start.',
    unit: 'per shift over',
    breach: 'Ada Brook: 6 shifts on the 6 days Mon 4 Jan–Sat 9 Jan; at most 5 days in a row',
    source: practice,
    workingTime: true,
    fields: [{ name: 'days', label: 'At most (days in a row)', min: 1, max: 27 }],
  },
  maxNightsInRow: {
    name: 'Nights in a row',
    description: 'At most `nights` night shifts on consecutive days.',
    unit: 'per night over',
    breach: 'Ada Brook: 5 nights on the 5 days Mon 4 Jan–Fri 8 Jan; at most 4 in a row',
    source: practice,
    workingTime: true,
    fields: [{ name: 'nights', label: 'At most (nights in a row)', min: 1, max: 27 }],
  },
  contractedHours: {
    name: 'Close to contracted hours',
    description: 'Hours worked plus credited absence near contracted hours/week × days/7, within `toleranceHours`.',
    unit: 'per hour outside the tolerance',
    breach: 'Ada Brook: 24 h over the period against 37.5 h contracted (± 8 h)',
    source: practice,
    workingTime: false,
    fields: [{ name: 'toleranceHours', label: 'Tolerance (hours)', min: 0, max: 500, step: 0.5 }],
  },
  fairNights: {
    name: 'Fair share of nights',
    description: 'Nobody works more night shifts than their fair share, rounded up.',
    unit: 'per night over the share',
    breach: 'Ada Brook: 3 night shifts; fair share is 2',
    source: practice,
    workingTime: false,
    fields: [],
  },
  fairWeekends: {
    name: 'Fair share of weekends',
    description: 'Nobody works more weekend shifts than their fair share, rounded up.',
    unit: 'per weekend shift over the share',
    breach: 'Ada Brook: 4 weekend shifts; fair share is 2',
    source: practice,
    workingTime: false,
    fields: [],
  },
  skillMix: {
    name: 'Skill mix per shift',
    description: 'At least `min` people with a skill on each shift (of a pattern).',
    unit: 'per person short',
    breach: 'the early shift on Mon 4 Jan has 0 with First aid; at least 1',
    source: practice,
    workingTime: false,
    fields: [],
  },
};

export const TERM_WORDS: Record<TermKind, RuleWords & { workingTime: boolean; fields: ParamField[] }> = {
  minHours: { name: 'At least these hours', description: 'At least `hours` worked (plus credited absence) over the covered period.', unit: 'per hour short', breach: 'Ada Brook (term): 16 h worked from Mon 4 Jan; at least 24 h', workingTime: false, fields: [{ name: 'hours', label: 'At least (hours)', min: 0, max: 2000 }] },
  maxHours: { name: 'At most these hours', description: 'At most `hours` worked (plus credited absence) over the covered period.', unit: 'per hour over', breach: 'Ada Brook (term): 40 h worked from Mon 4 Jan; at most 32 h', workingTime: true, fields: [{ name: 'hours', label: 'At most (hours)', min: 0, max: 2000 }] },
  noNights: { name: 'No nights', description: 'No night shifts.', unit: 'per night worked', breach: 'Ada Brook (term: no nights) works the night shift on Mon 4 Jan', workingTime: true, fields: [] },
  maxNights: { name: 'At most these nights', description: 'At most `count` night shifts over the covered period.', unit: 'per night over', breach: 'Ada Brook (term): 5 nights; at most 4', workingTime: true, fields: [{ name: 'count', label: 'At most (nights)', min: 0, max: 400 }] },
  maxWeekends: { name: 'At most these weekends', description: 'At most `count` weekends worked (a shift starting on the Saturday or Sunday).', unit: 'per weekend over', breach: 'Ada Brook (term): 3 weekends worked; at most 2', workingTime: false, fields: [{ name: 'count', label: 'At most (weekends)', min: 0, max: 60 }] },
  daysOff: { name: 'Fixed days off', description: 'No shift starting on these weekdays.', unit: 'per shift', breach: 'Ada Brook (term: days off Wed) works the early shift on Wed 6 Jan', workingTime: false, fields: [] },
  maxShiftsPerWeek: { name: 'Shifts per week', description: 'At most `count` shifts starting in each calendar week (Mon–Sun).', unit: 'per shift over', breach: 'Ada Brook (term): 5 shifts in the week Mon 4 Jan–Sun 10 Jan; at most 4', workingTime: true, fields: [{ name: 'count', label: 'At most (shifts a week)', min: 0, max: 21 }] },
  earliestStart: { name: 'Earliest start', description: 'No shift starting before this time of day.', unit: 'per shift', breach: 'Ada Brook (term: not before 09:00) works the early shift on Mon 4 Jan', workingTime: false, fields: [] },
  latestEnd: { name: 'Latest end', description: 'Every shift ends on its start day at or before this time.', unit: 'per shift', breach: 'Ada Brook (term: done by 18:00) works the late shift on Mon 4 Jan', workingTime: false, fields: [] },
  allowedPatterns: { name: 'Only these shifts', description: 'Only shifts of the listed patterns.', unit: 'per shift outside', breach: 'Ada Brook (term: early, late only) works the night shift on Mon 4 Jan', workingTime: false, fields: [] },
};

/** Display order of the rules form and the docs. */
const DEFAULTS = ruleSetSchema.parse({});
export const RULE_CATALOGUE: RuleEntry[] = (Object.keys(RULE_WORDS) as RuleName[]).map((id) => ({
  id,
  ...RULE_WORDS[id],
  sourceText: sourceText(RULE_WORDS[id].source),
  defaults: DEFAULTS[id],
  fields: RULE_WORDS[id].fields,
}));
export const TERM_CATALOGUE: TermEntry[] = TERM_KINDS.map((kind) => ({ kind, ...TERM_WORDS[kind] }));

export { WORKING_TIME_CAUTION };

/** The rules table of docs/roster-format.md, generated from the catalogue. */
export function rulesTableMarkdown(): string {
  const fmt = (v: unknown) => (v === undefined ? 'roster period' : JSON.stringify(v));
  const rows = RULE_CATALOGUE.map((r) => {
    const d = r.defaults as Record<string, unknown>;
    const limits = Object.keys(d).filter((k) => !['enabled', 'hard', 'weight'].includes(k));
    for (const f of r.fields) if (!limits.includes(f.name)) limits.push(f.name);
    const lim = limits.length ? limits.map((k) => `\`${k}\` (${fmt(d[k])})`).join(', ') : '–';
    const def = `${d.enabled ? '' : 'off, '}${d.hard ? 'hard' : 'soft'} (${d.weight})`;
    return `| \`${r.id}\` | ${r.name}: ${r.description.replace(/\|/g, '\\|')} | ${lim} | ${r.unit} | ${def} | ${r.sourceText} |`;
  });
  return ['| rule | what it checks | limits (default) | unit of a soft violation | default | source |', '| --- | --- | --- | --- | --- | --- |', ...rows].join('\n');
}

/** The per-person terms table of docs/roster-format.md. */
export function termsTableMarkdown(): string {
  const rows = TERM_CATALOGUE.map((t) => `| \`${t.kind}\` | ${t.name}: ${t.description} | ${t.unit} |`);
  return ['| kind | what it checks | unit of a soft violation |', '| --- | --- | --- |', ...rows].join('\n');
}
