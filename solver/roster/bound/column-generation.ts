/**
 * Dantzig–Wolfe column generation for the person/shift decomposition of lagrangian.ts, with a
 * restricted master LP solved by HiGHS (WebAssembly) and Wentges dual smoothing.
 *
 * Master (maximise), over convex combinations of the subproblems' solutions:
 *
 *   max Σ_c score_c λ_c + Σ_y score_y λ_y + Σ_{p,j,t} f_pj(t) θ_pjt − M·(slacks)
 *   s.t. Σ_{c of shift h} λ_c = 1,  Σ_{y of person p} λ_y = 1,  Σ_t θ_pjt = 1,
 *        Σ_{c ∋ (h,p)} λ_c − Σ_{y ∋ (h,p)} λ_y ± slack = 0        (dual y_hp  = μ_hp)
 *        Σ_y S_j(y) λ_y − Σ_t t θ_pjt ± slack = 0                   (dual y_pj  = −ν_pj)
 *
 * where c are shift configurations, y person schedules (window factors exact), θ the sums of each
 * relaxed period factor. Its LP optimum equals min_{μ,ν} L(μ, ν) (LP duality; the slacks box the
 * duals at |μ| ≤ M, harmless when M exceeds any seat's worth). Each round:
 *
 *   π_sep = α π_center + (1 − α) π_master         (Wentges smoothing, α = `smoothing`)
 *   L(π_sep) = evaluateLagrangian(...)            (the pricing problems: shift DPs, person DPs)
 *   bound ← min(bound, L(π_sep)); π_center ← π_sep when it lowers the bound
 *   add every priced column with positive reduced cost at π_master; re-solve the master.
 *
 * Every L(π) is a proven upper bound (weak duality), so `bound` is valid at any moment; the
 * restricted master's value is a lower estimate of the relaxation, and bound − master → 0 as
 * the method converges (finite convergence of column generation; mis-pricing under smoothing
 * moves the centre, so the gap shrinks geometrically). Deterministic: no randomness, and the
 * same columns in the same order give HiGHS the same LPs.
 *
 * The restricted master solved with integral λ, θ (`integerRoster`) is a primal heuristic: its
 * shift columns put together are a roster (price-and-branch).
 */
import { withAux, type CompiledRoster } from '../compile';
import { applyDual, dualOf, evaluateLagrangian, shiftColumnOf, type Columns, type DualStart, type LagrangianSetup } from '../lagrangian';

export type { DualStart };
import type { HighsPersistentModel, HighsRuntime } from './highs';

export interface ColumnGenerationOptions {
  /** Weight of the stability centre in the pricing point (0 = plain Kelley/DW). */
  smoothing: number;
  /** Slack cost: the box |μ| ≤ M the master's duals live in. 0 = automatic. */
  bigM: number;
  /** Roster (model values) whose schedules seed the master, so it starts with a feasible integral point. */
  incumbent?: ArrayLike<number>;
  /** Multipliers of a previous run: the first pricing point and stability centre. */
  start?: DualStart;
  /** Multipliers in this setup's own indexing (e.g. from a subgradient warm-up); wins over `start`. */
  startArrays?: { mu: Float64Array; nu: Float64Array[] };
}

export const DEFAULT_COLUMN_GENERATION: ColumnGenerationOptions = { smoothing: 0.5, bigM: 0 };

export interface ColumnGeneration {
  /** Lowest L so far: a proven upper bound on the model's best score. */
  readonly bound: number;
  /** Value of the restricted master LP at its last solve (lower estimate of the relaxation). */
  readonly master: number;
  readonly rounds: number;
  readonly columns: number;
  /** True once bound − master ≤ tolerance: the relaxation is solved. */
  readonly converged: boolean;
  /** Run rounds until `deadline` (by `now`) or convergence. */
  run(deadline: number, now: () => number): void;
  /** Multipliers at the best bound, keyed for a later run (DualStart). */
  dual(): DualStart;
  /** The roster made of each shift's heaviest column in the last master LP solution (exact when that solution is integral); aux variables at their best (withAux). */
  lpRoster(): Int32Array | null;
  /** Why the master stopped (HiGHS could not solve it), or undefined; bounds reported before stay valid. */
  readonly failed: string | undefined;
  /** Solve the restricted master with integral columns (time limit in s): a roster, or null. */
  integerRoster(timeLimitS: number): Int32Array | null;
  dispose(): void;
}

const B = 1e6; // seeds the master with the incumbent's own schedules (see seed())

export function createColumnGeneration(setup: LagrangianSetup, highs: HighsRuntime, options: Partial<ColumnGenerationOptions> = {}): ColumnGeneration {
  const o = { ...DEFAULT_COLUMN_GENERATION, ...options };
  const compiled: CompiledRoster = setup.compiled;
  const domains = setup.domains;
  const nSh = setup.shifts.length;
  const nP = setup.people.length;
  const pj: number[] = []; // offset of person i's period factors
  let nPJ = 0;
  setup.people.forEach((pp, i) => ((pj[i] = nPJ), (nPJ += pp.period.length)));
  const rowConvP = nSh, rowConvPJ = nSh + nP, rowMu = rowConvPJ + nPJ, rowNu = rowMu + setup.nMu;
  const nRows = rowNu + nPJ;

  let M = o.bigM;
  if (M <= 0) {
    // above what one person on one shift can be worth: the largest finite unary range times a margin
    let r = 0;
    for (const f of compiled.model.factors)
      if (f.kind === 'unary') for (let x = 0; x < f.table.length; x++) if (Number.isFinite(f.table[x]!)) r = Math.max(r, Math.abs(f.table[x]!));
    M = Math.max(1000, 20 * r);
  }

  const m: HighsPersistentModel = highs.createModel();
  m.options.set({ output_flag: false, solver: 'simplex', presolve: 'off', simplex_strategy: 4 });
  m.changeObjectiveSense(highs.constants.objectiveSense.maximize);
  {
    const lower = new Float64Array(nRows), upper = new Float64Array(nRows);
    for (let r = 0; r < rowMu; r++) lower[r] = upper[r] = 1;
    m.addRows({ lower, upper, matrix: { format: 'csr', numRows: nRows, numCols: 0, starts: new Int32Array(nRows + 1), indices: new Int32Array(0), values: new Float64Array(0) } });
  }

  // column bookkeeping
  type Col = { kind: 'shift'; shift: number; values: number[] } | { kind: 'person'; person: number } | { kind: 'theta' } | { kind: 'slack' };
  const cols: Col[] = [];
  const seen = new Set<string>();
  const pending = { cost: [] as number[], starts: [0] as number[], idx: [] as number[], val: [] as number[], upper: [] as number[] };
  const push = (c: Col, cost: number, entries: [number, number][], upper = Infinity) => {
    cols.push(c);
    pending.cost.push(cost);
    pending.upper.push(upper);
    for (const [r, v] of entries) if (v !== 0) pending.idx.push(r), pending.val.push(v);
    pending.starts.push(pending.idx.length);
  };
  const flush = () => {
    const n = pending.cost.length;
    if (!n) return;
    m.addCols({
      cost: Float64Array.from(pending.cost),
      lower: new Float64Array(n),
      upper: Float64Array.from(pending.upper),
      matrix: { format: 'csc', numRows: nRows, numCols: n, starts: Int32Array.from(pending.starts), indices: Int32Array.from(pending.idx), values: Float64Array.from(pending.val) },
    });
    pending.cost = [];
    pending.upper = [];
    pending.starts = [0];
    pending.idx = [];
    pending.val = [];
  };
  const addShift = (c: Columns['shifts'][number]) => {
    const key = `s${c.shift}:${c.values.join(',')}`;
    if (seen.has(key)) return false;
    seen.add(key);
    const e: [number, number][] = [[c.shift, 1]];
    // the shift side may seat one person twice (its all-different is left to the links): count them
    const count = new Map<number, number>();
    for (const q of c.mus) count.set(q, (count.get(q) ?? 0) + 1);
    for (const q of [...count.keys()].sort((a, b) => a - b)) e.push([rowMu + q, count.get(q)!]);
    push({ kind: 'shift', shift: c.shift, values: c.values }, c.score, e);
    return true;
  };
  const addPerson = (c: Columns['people'][number]) => {
    const mus = [...new Set(c.mus)].sort((a, b) => a - b);
    const key = `p${c.person}:${mus.join(',')}:${c.sums.join(',')}`;
    if (seen.has(key)) return false;
    seen.add(key);
    const e: [number, number][] = [[rowConvP + c.person, 1]];
    for (const q of mus) e.push([rowMu + q, -1]);
    c.sums.forEach((sv, j) => e.push([rowNu + pj[c.person]! + j, sv]));
    push({ kind: 'person', person: c.person }, c.score, e);
    return true;
  };

  // θ columns (every finite sum up to what the person can reach) and the slacks
  setup.people.forEach((pp, i) =>
    pp.period.forEach((pf, j) => {
      const tmax = pf.tmax ?? pf.table.length - 1;
      for (let t = 0; t <= tmax; t++) {
        const f = pf.table[t]!;
        if (!Number.isFinite(f)) continue;
        push({ kind: 'theta' }, f, [[rowConvPJ + pj[i]! + j, 1], [rowNu + pj[i]! + j, -t]]);
      }
    }),
  );
  const firstSlack = cols.length;
  for (let r = rowMu; r < nRows; r++) {
    push({ kind: 'slack' }, -M, [[r, 1]]);
    push({ kind: 'slack' }, -M, [[r, -1]]);
  }
  const endSlack = cols.length;

  const mu = new Float64Array(setup.nMu);
  const nu = setup.people.map((pp) => new Float64Array(pp.period.length));
  const gMu = new Float64Array(setup.nMu);
  const gNu = setup.people.map((pp) => new Float64Array(pp.period.length));
  const evalAt = (cmu: Float64Array, cnu: Float64Array[], collect?: Columns) => evaluateLagrangian(setup, cmu, cnu, gMu, gNu, collect).L;

  // seed: with μ = ±B on the incumbent's (shift, person) pairs each side's DP returns exactly the
  // incumbent's schedule (a feasible roster keeps every hard rule the DPs encode), so the master
  // starts with an integral point worth the incumbent's score
  const seed = () => {
    const inc = o.incumbent;
    const on = new Uint8Array(setup.nMu);
    if (inc) for (let s = 0; s < domains.length; s++) if (inc[s]! >= 0 && inc[s]! < domains[s]!.length) {
      const q = setup.muIndex[s]![inc[s]!]!;
      if (q >= 0) on[q] = 1;
    }
    const zeroNu = setup.people.map((pp) => new Float64Array(pp.period.length));
    for (const sign of [1, -1]) {
      const c: Columns = { shifts: [], people: [] };
      const bm = Float64Array.from(on, (v) => (inc ? (v ? sign * B : -sign * B) : 0));
      evalAt(bm, zeroNu, c);
      if (!inc) c.shifts.forEach(addShift);
      if (sign === 1 || !inc) c.people.forEach(addPerson);
      if (!inc) break;
    }
    // the shift side is seeded with the incumbent's seats themselves (its DP may seat a person twice)
    if (inc)
      for (let sh = 0; sh < nSh; sh++) {
        const col = shiftColumnOf(setup, sh, inc);
        if (col) addShift(col);
      }
  };
  seed();

  let bound = Infinity;
  let masterValue = -Infinity;
  let rounds = 0;
  let converged = false;
  let failed: string | undefined;
  const center = { mu: new Float64Array(setup.nMu), nu: setup.people.map((pp) => new Float64Array(pp.period.length)), set: false };
  const best = { mu: new Float64Array(setup.nMu), nu: setup.people.map((pp) => new Float64Array(pp.period.length)) };
  const keep = (cmu: Float64Array, cnu: Float64Array[], L: number) => {
    if (L < bound) {
      bound = L;
      best.mu.set(cmu);
      cnu.forEach((v, i) => best.nu[i]!.set(v));
      center.mu.set(cmu);
      cnu.forEach((v, i) => center.nu[i]!.set(v));
      center.set = true;
    }
  };
  if (o.startArrays) {
    mu.set(o.startArrays.mu);
    o.startArrays.nu.forEach((v, i) => nu[i]!.set(v));
  } else if (o.start) applyDual(setup, o.start, mu, nu);
  if (o.startArrays || o.start) {
    const c: Columns = { shifts: [], people: [] };
    keep(mu, nu, evalAt(mu, nu, c));
    c.shifts.forEach(addShift);
    c.people.forEach(addPerson);
  }
  flush();

  const solveMaster = () => {
    m.run();
    // the primal simplex occasionally ends in "unknown" (status 15) on a degenerate master:
    // retry once from a cold start with the dual simplex and presolve before giving up
    if (m.getModelStatus() !== highs.constants.modelStatus.optimal) {
      m.clearSolver();
      m.options.set({ simplex_strategy: 1, presolve: 'on' });
      m.run();
      m.options.set({ simplex_strategy: 4, presolve: 'off' });
    }
    // a master HiGHS could not solve gives no duals: stop (every bound so far stays valid)
    if (m.getModelStatus() !== highs.constants.modelStatus.optimal) {
      failed = `master LP status ${m.getModelStatus()}`;
      return null;
    }
    const sol = m.getSolution();
    masterValue = m.getObjectiveValue() + setup.constant;
    const y = sol.rowDual;
    for (let q = 0; q < setup.nMu; q++) mu[q] = y[rowMu + q]!;
    setup.people.forEach((pp, i) => pp.period.forEach((_, j) => (nu[i]![j] = -y[rowNu + pj[i]! + j]!)));
    return y;
  };

  const sepMu = new Float64Array(setup.nMu);
  const sepNu = setup.people.map((pp) => new Float64Array(pp.period.length));
  let alpha = o.smoothing;

  const round = () => {
    const y = solveMaster();
    if (!y) return;
    const a = center.set ? alpha : 0;
    for (let q = 0; q < setup.nMu; q++) sepMu[q] = a * center.mu[q]! + (1 - a) * mu[q]!;
    sepNu.forEach((v, i) => v.forEach((_, j) => (v[j] = a * center.nu[i]![j]! + (1 - a) * nu[i]![j]!)));
    const c: Columns = { shifts: [], people: [] };
    const L = evalAt(sepMu, sepNu, c);
    keep(sepMu, sepNu, L);
    rounds++;
    // reduced costs at the master's own duals decide which columns enter
    const tol = 1e-7 * Math.max(1, Math.abs(masterValue));
    let added = 0;
    for (const sc of c.shifts) {
      let rc = sc.score - y[sc.shift]!;
      for (const q of sc.mus) rc -= mu[q]!;
      if (rc > tol && addShift(sc)) added++;
    }
    for (const pc of c.people) {
      let rc = pc.score - y[rowConvP + pc.person]!;
      for (const q of new Set(pc.mus)) rc += mu[q]!;
      pc.sums.forEach((sv, j) => (rc += nu[pc.person]![j]! * sv));
      if (rc > tol && addPerson(pc)) added++;
    }
    flush();
    const gapTol = 1e-6 * Math.max(1, Math.abs(bound));
    if (bound - masterValue <= gapTol) converged = true;
    else if (added === 0) {
      // mis-priced: the smoothed point found nothing new for the master; lean towards the master's duals
      if (a === 0) converged = bound - masterValue <= 1e-4 * Math.max(1, Math.abs(bound));
      alpha = a * 0.5;
      if (alpha < 1e-3) alpha = 0;
    }
  };

  return {
    get bound() {
      return bound;
    },
    get master() {
      return masterValue;
    },
    get rounds() {
      return rounds;
    },
    get columns() {
      return cols.length;
    },
    get converged() {
      return converged;
    },
    get failed() {
      return failed;
    },
    run(deadline, now) {
      do {
        if (converged || failed) return;
        round();
      } while (now() < deadline);
    },
    dual() {
      return dualOf(setup, best.mu, best.nu);
    },
    lpRoster() {
      if (masterValue === -Infinity || m.getModelStatus() !== highs.constants.modelStatus.optimal) return null;
      const v = m.getSolution().colValue;
      const x = new Int32Array(domains.length).fill(-1);
      const w = new Float64Array(nSh).fill(-1);
      cols.forEach((c, k) => {
        if (c.kind === 'shift' && v[k]! > w[c.shift]!) {
          w[c.shift] = v[k]!;
          setup.shifts[c.shift]!.seats.forEach((s, i) => (x[s] = c.values[i]!));
        }
      });
      return x.every((val) => val >= 0) ? withAux(compiled, x) : null;
    },
    integerRoster(timeLimitS) {
      const n = cols.length;
      const sel = { kind: 'range' as const, from: 0, to: n - 1 };
      const types = new Int32Array(n);
      for (let k = 0; k < n; k++) if (cols[k]!.kind !== 'slack') types[k] = highs.constants.variableType.integer;
      // no slack in an integer roster: it would break a link between a shift and a person
      const slackSel = { kind: 'range' as const, from: firstSlack, to: endSlack - 1 };
      const ns = endSlack - firstSlack;
      m.changeColsBounds(slackSel, new Float64Array(ns), new Float64Array(ns));
      m.changeColsIntegrality(sel, types);
      m.options.set({ time_limit: timeLimitS, mip_rel_gap: 1e-6 });
      let out: Int32Array | null = null;
      try {
        m.run();
        if (Number(m.info.get('primal_solution_status')) === 2) {
          const v = m.getSolution().colValue;
          const x = new Int32Array(domains.length).fill(-1);
          cols.forEach((c, k) => {
            if (c.kind === 'shift' && v[k]! > 0.5) setup.shifts[c.shift]!.seats.forEach((s, i) => (x[s] = c.values[i]!));
          });
          if (x.every((val) => val >= 0)) out = withAux(compiled, x);
        }
      } finally {
        m.clearIntegrality();
        m.changeColsBounds(slackSel, new Float64Array(ns), new Float64Array(ns).fill(Infinity));
        m.options.set({ time_limit: 1e9 });
      }
      return out;
    },
    dispose() {
      m.dispose();
    },
  };
}
