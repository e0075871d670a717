/**
 * Rule weights from a coordinator's edits: a structured SVM (Tsochantaridis, Joachims, Hofmann &
 * Altun, "Large margin methods for structured and interdependent output variables", JMLR 2005)
 * with margin rescaling, n-slack cutting planes, non-negative weights and a prior towards the
 * current weights, with solveRoster as the separation oracle.
 *
 * Each edit i is a preference: the roster the coordinator kept, y⁺ᵢ, over the one proposed, y⁻ᵢ.
 * A roster's score is w·φ(y) + c(y) (features.ts: φ in violation units of the learned rules, c the
 * wishes and pairings as entered). The problem, over the working sets Cᵢ of rival rosters:
 *
 *   min_{w ≥ 0, ξ ≥ 0}  λ/2 ‖S⁻¹(w − w0)‖² + (1/n) Σᵢ ξᵢ
 *   s.t.  w·(φ(y⁺ᵢ) − φ(y)) + c(y⁺ᵢ) − c(y) ≥ Δ(y⁺ᵢ, y) − ξᵢ   for every y in Cᵢ,
 *
 * Δ = marginPerSeat × seats where y differs from y⁺ᵢ. Cᵢ starts as {y⁻ᵢ}. Each round the oracle
 * asks solveRoster (with a time limit) for the most violating roster among those that keep y⁺ᵢ
 * outside the seats the coordinator changed, loss-augmented:
 *
 *   ŷᵢ = argmax_{y : y = y⁺ᵢ off Sᵢ}  w·φ(y) + c(y) + Δ(y⁺ᵢ, y),
 *
 * and adds it when it violates by more than the tolerance. That restriction is the modelling
 * assumption: a coordinator who puts someone in a seat preferred them to the others who could
 * take it, not to every roster far away (their edit is rarely the best whole roster under their
 * own weights, so asking for that would push the weights away from theirs).
 *
 * The working-set problem is solved in its dual by coordinate ascent. With αᵢy ≥ 0,
 * Σ_y αᵢy ≤ 1/n and dᵢy = φ(y⁺ᵢ) − φ(y), the weights for given α are
 *
 *   w(α) = max(0, w0 + (1/λ) S² Σᵢy αᵢy dᵢy)        (componentwise: the non-negativity),
 *
 * and each step moves one αᵢy by its dual gradient Δᵢy − (c(y⁺ᵢ) − c(y)) − w(α)·dᵢy over the
 * curvature bound ‖S dᵢy‖²/λ, clipped to its box. S = diag(s) scales the prior (options.priorScale:
 * the regulariser is ‖S⁻¹(w − w0)‖²; S = I gives the plain ‖w − w0‖²). Preconditions: every preference's rosters belong
 * to its roster (seat and person ids), and the rule set is the one being tuned.
 *
 * options.formulation 'oneSlack' solves the same problem with one slack shared by all edits
 * (Joachims, Finley & Yu 2009): min λ/2 ‖S⁻¹(w − w0)‖² + ξ over constraints
 * (1/n) Σᵢ [w·dᵢ(ȳᵢ) + eᵢ(ȳᵢ)] ≥ (1/n) Σᵢ Δᵢ(ȳᵢ) − ξ, one per choice of a rival ȳᵢ (or y⁺ᵢ
 * itself) for every edit. Over the same rivals its optimum is the n-slack's; what differs is the
 * working set (a few dense constraints, each built from the most violating found rival of every
 * edit at the current w) and so the dual the coordinate ascent has to settle.
 */
import type { Roster, RosterAssignment } from '../../shared/roster/schema';
import { solveRoster } from '../roster/solve-roster';
import { currentWeights, learnableRules, makeFeaturizer, scorerTermKeys, withWeights, type Features, type RuleSetLike } from './features';
import { resolveLearnOptions, type LearnOptions } from './options';

export type Preference = {
  /** The roster as it was when the edit was made (its shifts, people, wishes, pairings, pins). */
  roster: Roster;
  /** The roster the coordinator kept. */
  kept: RosterAssignment;
  /** The roster they were shown (the solver's, or their own earlier save). */
  proposed: RosterAssignment;
};

export type LearnResult = {
  /** The learned rules, in the order of `start` and `weights`. */
  keys: string[];
  start: number[];
  weights: number[];
  /** Edits that took part (an edit that changes no seat is left out, see `skipped`). */
  used: number[];
  skipped: { index: number; reason: string }[];
  /** Edits whose kept roster the weights do not score above the proposed one, before and after. */
  disagreeBefore: number[];
  disagreeAfter: number[];
  /** Pairs of edits that undo each other: no weights can agree with both. */
  contradictions: [number, number][];
  /** Edits no non-negative weights can explain: they lower no rule's count and gain no wish or pairing points. */
  unexplainable: number[];
  objective: number;
  rounds: number;
  oracleCalls: number;
  constraints: number;
  timeMs: number;
  stopReason: 'converged' | 'rounds' | 'time';
};

type Rival = { d: number[]; e: number; loss: number; alpha: number; key: string };
type Example = {
  index: number;
  pref: Preference;
  featurize: (a: RosterAssignment) => Features;
  kept: Features;
  changed: string[];
  rivals: Rival[];
  /** The oracle may run: the kept roster keeps every hard rule of the rule set being tuned. */
  oracle: boolean;
};

const dot = (a: readonly number[], b: readonly number[]) => a.reduce((m, x, i) => m + x * b[i], 0);
const sameHolder = (a: string | null | undefined, b: string | null | undefined) => (a ?? null) === (b ?? null);
const assignmentKey = (a: RosterAssignment, seats: readonly string[]) => seats.map((s) => a[s] ?? '-').join('|');

function rival(ex: Example, f: Features, differing: number, marginPerSeat: number, key: string): Rival {
  return { d: ex.kept.rules.map((x, k) => x - f.rules[k]), e: ex.kept.offset - f.offset, loss: marginPerSeat * differing, alpha: 0, key };
}

/** How far each edit's kept roster is ahead of the proposed one under w (≤ 0: the weights disagree). */
function leads(examples: Example[], w: readonly number[]): number[] {
  return examples.map((ex) => dot(w, ex.rivals[0].d) + ex.rivals[0].e);
}

const violation = (r: Rival, w: readonly number[]) => r.loss - r.e - dot(w, r.d);

/**
 * The working-set QP, in the dual (see the file comment), over groups of constraints that share a
 * slack: an edit's rivals (n-slack) or the one list of aggregated constraints (1-slack). Each
 * group's α sum to at most 1/groups. Returns w(α) and the primal objective.
 */
function solveWorkingSet(groups: readonly { rivals: Rival[] }[], w0: readonly number[], s2: readonly number[], o: LearnOptions, pairs = o.dualPairSteps): { w: number[]; objective: number } {
  const n = groups.length;
  const lambda = o.priorStrength;
  const K = w0.length;
  const v = new Array<number>(K).fill(0); // Σ α d
  for (const ex of groups) for (const r of ex.rivals) r.d.forEach((x, k) => (v[k] += r.alpha * x));
  const wOf = () => w0.map((x, k) => Math.max(0, x + (s2[k] * v[k]) / lambda));
  const primal = (w: number[]) => {
    let data = 0;
    for (const ex of groups) data += Math.max(0, ...ex.rivals.map((r) => r.loss - r.e - dot(w, r.d)));
    return (lambda / 2) * w.reduce((m, x, k) => m + (x - w0[k]) ** 2 / s2[k], 0) + data / n;
  };
  let w = wOf();
  for (let sweep = 0; sweep < o.dualSweeps; sweep++) {
    let moved = 0;
    for (const ex of groups) {
      let used = ex.rivals.reduce((m, r) => m + r.alpha, 0);
      for (const r of ex.rivals) {
        const norm = r.d.reduce((m, x, k) => m + s2[k] * x * x, 0);
        if (norm === 0) continue;
        const grad = r.loss - r.e - dot(w, r.d);
        const next = Math.min(Math.max(0, r.alpha + (grad * lambda) / norm), 1 / n - (used - r.alpha));
        const step = next - r.alpha;
        if (step === 0) continue;
        used += step;
        r.alpha = next;
        r.d.forEach((x, k) => (v[k] += step * x));
        w = wOf();
        moved = Math.max(moved, Math.abs(step) * n);
      }
      // once a group's α reach their sum's cap, no single α can rise: move α from the group's least
      // violated constraint to its most violated one (the pair step of SMO, Platt 1998)
      for (let rep = 0; pairs && used >= 1 / n - 1e-12 && rep < ex.rivals.length; rep++) {
        let hi = -1;
        let lo = -1;
        let gHi = -Infinity;
        let gLo = Infinity;
        ex.rivals.forEach((r, j) => {
          const g = violation(r, w);
          if (g > gHi) [gHi, hi] = [g, j];
          if (r.alpha > 0 && g < gLo) [gLo, lo] = [g, j];
        });
        if (hi < 0 || lo < 0 || hi === lo || gHi - gLo <= 1e-12) break;
        const a = ex.rivals[hi];
        const b = ex.rivals[lo];
        const norm = a.d.reduce((m, x, k) => m + s2[k] * (x - b.d[k]) ** 2, 0);
        if (norm === 0) break;
        const t = Math.min(b.alpha, ((gHi - gLo) * lambda) / norm);
        a.alpha += t;
        b.alpha -= t;
        a.d.forEach((x, k) => (v[k] += t * (x - b.d[k])));
        w = wOf();
        moved = Math.max(moved, t * n);
      }
    }
    if (moved < 1e-7) break;
  }
  return { w, objective: primal(w) };
}

/**
 * s² of the prior per weight (options.priorScale). The spread is taken over the edits' proposed
 * rosters only (what every learner sees before any oracle call); a rule no edit moves gets σ̄.
 */
function priorScales(examples: readonly Example[], w0: readonly number[], scale: LearnOptions['priorScale']): number[] {
  const relative = w0.map((x) => (scale === 'relative' || scale === 'relativeSpread' ? Math.max(x, 1) : 1));
  if (scale === 'relative' || scale === 'absolute') return relative.map((x) => x * x);
  const rms = w0.map((_, k) => Math.sqrt(examples.reduce((m, ex) => m + ex.rivals[0].d[k] ** 2, 0) / Math.max(1, examples.length)));
  const positive = rms.filter((x) => x > 0);
  const mean = positive.length ? Math.exp(positive.reduce((m, x) => m + Math.log(x), 0) / positive.length) : 1;
  return relative.map((x, k) => (x * mean / (rms[k] > 0 ? rms[k] : mean)) ** 2);
}

/**
 * The 1-slack working set (Joachims, Finley & Yu 2009, margin rescaling): each constraint is the
 * mean over the edits of one rival each, an edit adding nothing where its kept roster beats all its
 * rivals by their margins (ȳᵢ = y⁺ᵢ). `tighten` adds, from the rivals found so far, the most
 * violated such constraint at the current w until none violates by more than the tolerance (at
 * most cacheRounds), so the oracle is asked again only once the found rivals are used up.
 */
function oneSlack(examples: readonly Example[], w0: readonly number[], s2: readonly number[], o: LearnOptions) {
  const group = { rivals: [] as Rival[] };
  const keys = new Set<string>();
  const K = w0.length;
  let w = [...w0];
  let objective = 0;
  const aggregate = (): Rival => {
    const d = new Array<number>(K).fill(0);
    let e = 0;
    let loss = 0;
    const picks: number[] = [];
    for (const ex of examples) {
      let best = -1;
      let most = 0;
      ex.rivals.forEach((r, j) => {
        const x = violation(r, w);
        if (x > most) [best, most] = [j, x];
      });
      picks.push(best);
      if (best < 0) continue;
      const r = ex.rivals[best];
      r.d.forEach((x, k) => (d[k] += x / examples.length));
      e += r.e / examples.length;
      loss += r.loss / examples.length;
    }
    return { d, e, loss, alpha: 0, key: picks.join(',') };
  };
  const tighten = (): number => {
    let added = 0;
    for (let i = 0; i < o.cacheRounds; i++) {
      const c = aggregate();
      const slack = Math.max(0, ...group.rivals.map((q) => violation(q, w)));
      if (keys.has(c.key) || violation(c, w) <= slack + o.violationTolerance) break;
      keys.add(c.key);
      group.rivals.push(c);
      added++;
      ({ w, objective } = solveWorkingSet([group], w0, s2, o, true));
    }
    return added;
  };
  return { tighten, w: () => w, objective: () => objective, constraints: () => group.rivals.length };
}

/** The oracle's roster: the rule set at w, every seat the coordinator did not change pinned as kept, and the Hamming loss as avoid wishes. */
function oracleRoster(ex: Example, rules: RuleSetLike, keys: readonly string[], w: readonly number[], marginPerSeat: number): Roster {
  const { roster, kept } = ex.pref;
  const free = new Set(ex.changed);
  const shiftOf = new Map(roster.seats.map((s) => [s.id, s.shift]));
  const pins = roster.seats.filter((s) => !free.has(s.id)).map((s) => ({ seat: s.id, person: kept[s.id] ?? null }));
  // +Δ per changed seat is, up to a constant, −marginPerSeat when the kept person is back on that shift
  const loss = ex.changed.flatMap((s) => (kept[s] ? [{ person: kept[s]!, shift: shiftOf.get(s)!, kind: 'avoid' as const, strength: marginPerSeat }] : []));
  return { ...roster, rules: withWeights(rules, keys, w) as Roster['rules'], pins, wishes: [...roster.wishes, ...loss] };
}

/**
 * Learn rule weights from preferences (see the file comment for the problem and the update).
 * `rules` is the rule set being tuned: its soft, enabled rules are learned from their weights as
 * the prior; hard rules stay hard and disabled rules off.
 */
export async function learnWeights(rules: RuleSetLike, preferences: readonly Preference[], options: Partial<LearnOptions> = {}, signal?: AbortSignal): Promise<LearnResult> {
  const o = resolveLearnOptions(options);
  const now = o.clock ?? Date.now;
  const t0 = now();
  const termKeys = preferences.length ? scorerTermKeys(preferences[0].roster) : [];
  const keys = learnableRules(rules, termKeys);
  const w0 = currentWeights(rules, keys);
  const skipped: { index: number; reason: string }[] = [];
  const examples: Example[] = [];
  preferences.forEach((pref, index) => {
    const changed = pref.roster.seats.map((s) => s.id).filter((s) => !sameHolder(pref.kept[s], pref.proposed[s]));
    if (changed.length === 0) return void skipped.push({ index, reason: 'the kept roster is the proposed one' });
    const featurize = makeFeaturizer(pref.roster, rules, keys);
    const kept = featurize(pref.kept);
    const ex: Example = { index, pref, featurize, kept, changed, rivals: [], oracle: kept.feasible };
    ex.rivals.push(rival(ex, featurize(pref.proposed), changed.length, o.marginPerSeat, assignmentKey(pref.proposed, changed)));
    examples.push(ex);
  });

  const lead0 = leads(examples, w0);
  const contradictions: [number, number][] = [];
  const unexplainable: number[] = [];
  const tiny = (x: number, scale: number) => Math.abs(x) <= 1e-9 * Math.max(1, scale);
  examples.forEach((a, i) => {
    const ra = a.rivals[0];
    // no w ≥ 0 puts the kept roster ahead when it breaks no rule less and gains no wish or pairing points
    if (ra.d.every((x) => x <= 1e-9) && ra.e <= 0) unexplainable.push(a.index);
    for (let j = i + 1; j < examples.length; j++) {
      const rb = examples[j].rivals[0];
      const scale = ra.d.reduce((m, x) => m + Math.abs(x), Math.abs(ra.e));
      if (scale > 0 && ra.d.every((x, k) => tiny(x + rb.d[k], scale)) && tiny(ra.e + rb.e, scale)) contradictions.push([a.index, examples[j].index]);
    }
  });

  const s2 = priorScales(examples, w0, o.priorScale);
  const one = o.formulation === 'oneSlack' ? oneSlack(examples, w0, s2, o) : null;
  let { w, objective } = examples.length ? (one ? (one.tighten(), { w: one.w(), objective: one.objective() }) : solveWorkingSet(examples, w0, s2, o)) : { w: [...w0], objective: 0 };
  let rounds = 0;
  let oracleCalls = 0;
  let stopReason: LearnResult['stopReason'] = o.rounds === 0 ? 'rounds' : 'converged';
  for (let round = 0; round < o.rounds && examples.length; round++) {
    let added = 0;
    rounds++;
    for (const ex of examples) {
      if (!ex.oracle) continue;
      if (now() - t0 + o.oracleTimeLimitMs > o.timeLimitMs || signal?.aborted) {
        stopReason = 'time';
        break;
      }
      oracleCalls++;
      const solved = await solveRoster(oracleRoster(ex, rules, keys, w, o.marginPerSeat), { timeLimitMs: o.oracleTimeLimitMs, seed: o.seed + oracleCalls, start: ex.pref.kept, lagrangianShare: 0, lnsShare: 0, clock: o.clock }, signal);
      if (solved.status !== 'solved' || !solved.score.feasible) continue;
      const y = solved.decoded.assignment;
      const key = assignmentKey(y, ex.changed);
      if (ex.rivals.some((r) => r.key === key)) continue;
      const differing = ex.changed.filter((s) => !sameHolder(y[s], ex.pref.kept[s])).length;
      if (differing === 0) continue;
      const r = rival(ex, ex.featurize(y), differing, o.marginPerSeat, key);
      const slack = Math.max(0, ...ex.rivals.map((q) => violation(q, w)));
      // 1-slack: every rival found is kept for the aggregated constraints (the shared slack decides)
      if (one ? violation(r, w) > o.violationTolerance : violation(r, w) > slack + o.violationTolerance) {
        ex.rivals.push(r);
        added++;
      }
    }
    if (one) {
      added = added > 0 ? one.tighten() : 0;
      ({ w, objective } = { w: one.w(), objective: one.objective() });
    } else if (added > 0) ({ w, objective } = solveWorkingSet(examples, w0, s2, o));
    if (stopReason === 'time') break;
    if (added === 0) {
      stopReason = 'converged';
      break;
    }
    stopReason = 'rounds';
  }
  w = w.map((x) => (x < o.zeroBelow ? 0 : x));
  const lead1 = leads(examples, w);
  return {
    keys,
    start: w0,
    weights: w,
    used: examples.map((e) => e.index),
    skipped,
    disagreeBefore: examples.filter((_, i) => lead0[i] <= 1e-9).map((e) => e.index),
    disagreeAfter: examples.filter((_, i) => lead1[i] <= 1e-9).map((e) => e.index),
    contradictions,
    unexplainable,
    objective,
    rounds,
    oracleCalls,
    constraints: one ? one.constraints() : examples.reduce((m, e) => m + e.rivals.length, 0),
    timeMs: now() - t0,
    stopReason,
  };
}

/**
 * Edits (of `preferences`) whose kept roster the weights do not score above the proposed one: the
 * measure of disagreement, for held-out edits or past ones. Edits that change no seat are not counted.
 */
export function disagreements(rules: RuleSetLike, keys: readonly string[], weights: readonly number[], preferences: readonly Preference[]): { counted: number; disagree: number[] } {
  const disagree: number[] = [];
  let counted = 0;
  preferences.forEach((pref, i) => {
    if (pref.roster.seats.every((s) => sameHolder(pref.kept[s.id], pref.proposed[s.id]))) return;
    counted++;
    const f = makeFeaturizer(pref.roster, rules, keys);
    const a = f(pref.kept);
    const b = f(pref.proposed);
    if (dot(weights, a.rules) + a.offset - (dot(weights, b.rules) + b.offset) <= 1e-9) disagree.push(i);
  });
  return { counted, disagree };
}
