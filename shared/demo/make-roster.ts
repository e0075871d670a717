/**
 * Generic roster fixtures for tests and the benchmark: `makeRoster({ people: 60, weeks: 13 })`.
 * Deterministic for a seed. Seats are sized to about 85 % of the contracted hours, with
 * skill holders in proportion, so that rosters of any size are feasible with every rule on.
 */
import { rosterSchema, type Roster, type RosterInput, type RuleSet, type ShiftPatternInput, shiftPatternSchema } from '../roster/schema';
import { generateShifts } from '../roster/patterns';
import { addLocalDays } from '../roster/time';

/** Small fast seeded PRNG (mulberry32): fixtures must not change between runs. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const FIRST = ['Ada', 'Bram', 'Cleo', 'Dario', 'Edda', 'Fenn', 'Greta', 'Hal', 'Ines', 'Joss', 'Kit', 'Lior', 'Mina', 'Nils', 'Orla', 'Pim', 'Quin', 'Rhea', 'Sol', 'Tove', 'Ulla', 'Vik', 'Wren', 'Yara', 'Zeno'];
const LAST = ['Ashgrove', 'Birchley', 'Coldwell', 'Dunstable', 'Elmstead', 'Fairoak', 'Glenholt', 'Hartwell', 'Ivybridge', 'Juniper', 'Kestrel', 'Larchmont', 'Mossley', 'Northfleet', 'Oakhurst', 'Pinecroft', 'Quarry', 'Redmarsh', 'Sallowfield', 'Thornbury'];

export type MakeRosterOptions = Partial<Omit<RosterInput, 'rules' | 'people'>> & {
  /** Number of people (default 12). */
  people?: number;
  /** Weeks in the period (default 2). */
  weeks?: number;
  /** First day (default Monday 2027-01-04). */
  start?: string;
  timeZone?: string;
  seed?: number;
  /** Shift patterns; default early/late/night sized to the team. */
  patterns?: ShiftPatternInput[];
  /** Wishes per person on average (default 2). */
  wishesPerPerson?: number;
  /** Number of pairings (default people / 6). */
  pairingCount?: number;
  /** Fraction of contracted hours the seats need (default 0.85). */
  load?: number;
  rules?: { [K in keyof RuleSet]?: Partial<RuleSet[K]> };
};

export const FIXTURE_SKILLS = [
  { id: 'medication', name: 'Medication round' },
  { id: 'first-aid', name: 'First aid' },
  { id: 'night-lead', name: 'Night lead' },
];

const ALL_DAYS = ['mon', 'tue', 'wed', 'thu', 'fri', 'sat', 'sun'] as const;

/** Early/late/night seats for a team: about `load` of contracted hours, 40/35/25 split. */
export function defaultPatterns(people: number, avgContract: number, load = 0.85): ShiftPatternInput[] {
  const perDay = Math.max(3, Math.round((people * avgContract * load) / 8 / 7));
  const night = Math.max(1, Math.round(perDay * 0.25));
  const late = Math.max(1, Math.round(perDay * 0.35));
  const early = Math.max(1, perDay - night - late);
  const med = Math.max(1, Math.round(people / 25));
  const seats = (skilled: { skill: string; count: number }[], total: number) => {
    const out: { skill: string | null; count: number }[] = [];
    let left = total;
    for (const s of skilled) {
      const c = Math.min(s.count, left);
      if (c > 0) out.push({ skill: s.skill, count: c });
      left -= c;
    }
    if (left > 0) out.push({ skill: null, count: left });
    return out;
  };
  return [
    { label: 'early', weekdays: [...ALL_DAYS], start: '07:00', end: '15:00', seats: seats([{ skill: 'medication', count: med }, { skill: 'first-aid', count: 1 }], early) },
    { label: 'late', weekdays: [...ALL_DAYS], start: '15:00', end: '23:00', seats: seats([{ skill: 'medication', count: med }], late) },
    { label: 'night', weekdays: [...ALL_DAYS], start: '23:00', end: '07:00', seats: seats([{ skill: 'night-lead', count: 1 }], night) },
  ];
}

/** A validated roster of the given size; every part can be overridden. */
export function makeRoster(options: MakeRosterOptions = {}): Roster {
  const {
    people: n = 12,
    weeks = 2,
    start = '2027-01-04',
    timeZone = 'Europe/London',
    seed = 1,
    patterns,
    wishesPerPerson = 2,
    pairingCount,
    load = 0.85,
    rules: ruleOverrides = {},
    ...rest
  } = options;
  const rnd = seededRandom(seed);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)];
  const contracts = [20, 24, 30, 36, 37.5];
  const base = Array.from({ length: n }, (_, i) => ({
    id: `p${String(i + 1).padStart(3, '0')}`,
    name: `${FIRST[i % FIRST.length]} ${LAST[(i * 7 + Math.floor(i / FIRST.length)) % LAST.length]}`,
    skills: [] as string[],
    contractedHoursPerWeek: contracts[(i * 3 + 1) % contracts.length],
  }));
  const avgContract = base.reduce((a, p) => a + p.contractedHoursPerWeek, 0) / Math.max(1, n);
  const pats = (patterns ?? defaultPatterns(n, avgContract, load)).map((p) => shiftPatternSchema.parse(p));
  // Skill holders in proportion to the skilled seats a day (plus one first-aider per shift for the
  // skill mix rule): about one holder per 4 such seats a week, plus one spare, spread over the list.
  const perDay = new Map<string, number>([['first-aid', pats.length]]);
  for (const p of pats) for (const g of p.seats) if (g.skill) perDay.set(g.skill, (perDay.get(g.skill) ?? 0) + (g.count * p.weekdays.length) / 7);
  FIXTURE_SKILLS.forEach((skill, k) => {
    const holders = Math.min(n, Math.ceil(((perDay.get(skill.id) ?? 0) * 7) / 4) + 1);
    for (let h = 0; h < holders; h++) base[Math.floor((h * n) / holders + k) % n].skills.push(skill.id);
  });
  const people = base.map((p) => ({ ...p, skills: [...new Set(p.skills)] }));
  const period = rest.period ?? { start, end: addLocalDays(start, weeks * 7 - 1), timeZone };
  const { shifts, seats } = generateShifts(pats, period);

  const wishes: NonNullable<RosterInput['wishes']> = [];
  const wishCount = Math.round(n * wishesPerPerson);
  for (let k = 0; k < wishCount && shifts.length > 0; k++) {
    const person = pick(people).id;
    const r = rnd();
    if (r < 0.15) wishes.push({ person, date: pick(shifts).start.slice(0, 10), kind: 'cannot' });
    else if (r < 0.55) wishes.push({ person, shift: pick(shifts).id, kind: 'prefer', strength: 1 + Math.floor(rnd() * 4) });
    else wishes.push({ person, shift: pick(shifts).id, kind: 'avoid', strength: 1 + Math.floor(rnd() * 4) });
  }
  const pairings: NonNullable<RosterInput['pairings']> = [];
  const seen = new Set<string>();
  const want = Math.min(pairingCount ?? Math.floor(n / 6), (n * (n - 1)) / 2);
  for (let guard = 0; pairings.length < want && guard < want * 20; guard++) {
    const a = pick(people).id;
    const b = pick(people).id;
    const key = a < b ? `${a}|${b}` : `${b}|${a}`;
    if (a === b || seen.has(key)) continue;
    seen.add(key);
    pairings.push({ a, b, score: rnd() < 0.6 ? 1 + Math.floor(rnd() * 4) : -(1 + Math.floor(rnd() * 4)) });
  }

  const rules: Record<string, unknown> = { skillMix: { requirements: [{ skill: 'first-aid', min: 1 }] } };
  for (const [k, v] of Object.entries(ruleOverrides)) rules[k] = { ...((rules[k] as object) ?? {}), ...v };

  return rosterSchema.parse({
    name: `Fixture: ${n} people × ${weeks} weeks (seed ${seed})`,
    period,
    skills: FIXTURE_SKILLS,
    people,
    shifts,
    seats,
    wishes,
    pairings,
    pins: [],
    rules: rules as RosterInput['rules'],
    ...rest,
  } satisfies RosterInput);
}
