/**
 * The shape of a rule module (STYLE.md, "A rule as one module") and the two contexts the
 * driver hands it: CompileContext (compile.ts: seats, domains, the personCount helper) and
 * CheckContext (score-roster.ts: who works what, straight from the roster).
 */
import type { Factor } from '../../model';
import type { ShiftFacts } from '../../../shared/roster/derive';
import type { Roster, RuleName, RuleSet, Term, TermKind } from '../../../shared/roster/schema';
import type { TermName } from '../term-names';
import { RULE_WORDS, TERM_WORDS, type RuleSource, type RuleWords } from './catalogue-words';

export type { RuleSource, RuleWords };

/** One choice of an auxiliary variable: the person's seats it needs free, and its own score. */
export type AuxChoice = { seats: number[]; score: number; label: string };

export interface CompileContext {
  roster: Roster;
  facts: ShiftFacts[];
  days: number;
  /** Minutes per unit of hour-weights in counting factors. */
  unit: number;
  nPeople: number;
  seatShift: number[];
  seatsOfShift: number[][];
  allSeats: number[];
  /** Seat variable → person per value (-1 open). */
  domains: number[][];
  /** Value index of person p in seat s, or -1. */
  valueAt(s: number, p: number): number;
  /** Credited absence hours per person and day (shared/roster/derive.ts absenceCredits). */
  credits: Float64Array[];
  factors: Factor[];
  termConstants: Record<TermName, number>;
  on(id: RuleName): boolean;
  /** Counting factor over the seats in `seats` person p could take; score(sum) from scoreAt. */
  personCount(term: TermName, detail: string, label: string, p: number, seats: number[], weightOf: (s: number) => number, scoreAt: (sum: number) => number, hard: boolean, cap: number, mergeKey?: string): void;
  /** Seat weight in minute units. */
  minutesW(s: number): number;
  one(s: number): number;
  /** Largest sum any feasible roster reaches over `spanDays` days (hard weekly limits), in shifts or minute units. */
  capFor(spanDays: number, minutesWeighted: boolean): number;
  /** Seats of shifts starting on days first..last that pass `pick`. */
  seatsStarting(first: number, last: number, pick?: (f: ShiftFacts) => boolean): number[];
  /**
   * An auxiliary variable for person p whose values are `choices`: value j forbids p on
   * choice j's seats (one hard counting factor each) and scores choice j's `score` (a unary).
   * Returns its variable index (after every seat).
   */
  auxChoice(term: TermName, detail: string, label: string, p: number, first: number, last: number, choices: AuxChoice[]): number;
}

export type Worked = { seat: number; shift: ShiftFacts };

export interface CheckContext {
  roster: Roster;
  facts: ShiftFacts[];
  days: number;
  credits: Float64Array[];
  /** Per person: the seats they hold, by shift start. */
  worked: Worked[][];
  /** Seat → person index, -1 open. */
  holder: number[];
  seatsOfShift: number[][];
  name(p: number): string;
  skillName(id: string): string;
  /** "Mon 4 Jan–Sun 10 Jan" for period days first..last. */
  range(first: number, last: number): string;
  on(id: RuleName): boolean;
  /** A breach: hard → infeasible, soft → −weight × units. */
  breach(term: TermName, hard: boolean, weight: number, units: number, message: string, people: number[], seats: number[]): void;
  /** Per-roster values computed once per scorer (fair shares, night workers). */
  memo<T>(key: string, make: () => T): T;
}

export interface RuleModule<Id extends RuleName = RuleName> {
  id: Id;
  words: RuleWords;
  source: RuleSource;
  /** Sets or breaks a working-time rule: screens show the caution (shared/caution.ts). */
  workingTime: boolean;
  /** Longer reading of the rule for explanations. */
  explain: string;
  /** Hard and person-independent: nobody may work shift f (shrinks domains; compile adds nothing for it). */
  excludesShift?(settings: RuleSet[Id], f: ShiftFacts): boolean;
  compile(ctx: CompileContext, settings: RuleSet[Id]): void;
  check(ctx: CheckContext, settings: RuleSet[Id]): void;
}

export type TermOf<K extends TermKind> = Extract<Term, { kind: K }>;

export interface TermModule<K extends TermKind = TermKind> {
  kind: K;
  words: RuleWords;
  workingTime: boolean;
  explain: string;
  /** Shift-level kinds: does working shift f break the term? Hard → the shift leaves the person's domain. */
  breaksShift?(term: TermOf<K>, f: ShiftFacts, roster: Roster): boolean;
  /** Compile person p's term (index i in their terms). Shift-level kinds get their unaries from the driver. */
  compile?(ctx: CompileContext, p: number, term: TermOf<K>, i: number): void;
  check?(ctx: CheckContext, p: number, term: TermOf<K>, i: number): void;
}

export function defineRule<Id extends RuleName>(m: Omit<RuleModule<Id>, 'words' | 'source' | 'workingTime'> & { id: Id }): RuleModule<Id> {
  const w = RULE_WORDS[m.id];
  return { words: { name: w.name, description: w.description, unit: w.unit, breach: w.breach }, source: w.source, workingTime: w.workingTime, ...m };
}

export function defineTerm<K extends TermKind>(m: Omit<TermModule<K>, 'words' | 'workingTime'> & { kind: K }): TermModule<K> {
  const w = TERM_WORDS[m.kind];
  return { words: { name: w.name, description: w.description, unit: w.unit, breach: w.breach }, workingTime: w.workingTime, ...m };
}

/** Does term t (with its `from`) cover shift f? */
export const covers = (t: { from?: string }, f: ShiftFacts) => t.from === undefined || f.date >= t.from;

/** "over limit" penalty of a rule: hard → -Infinity, soft → −weight × units over. */
export const overBy = (hard: boolean, weight: number, over: number) => (over > 1e-9 ? (hard ? -Infinity : -weight * over) : 0);
