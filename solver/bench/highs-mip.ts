/**
 * Independent reference for MAP on any solver Model: a mixed-integer programme in CPLEX LP
 * format, solved by HiGHS (npm `highs`, HiGHS compiled to WebAssembly). Dev-only — the
 * product's solver never imports this file (tests and the bench do).
 *
 * Encoding (every factor kind of solver/model/types.ts):
 * - binary x_i_v per variable i and value v, Σ_v x_i_v = 1; values a hard unary forbids are fixed at 0;
 * - unary → objective coefficients on x;
 * - pairwise / table → local-polytope marginals μ_c(x_c) ≥ 0 over the finite entries, each
 *   marginal summing to x_i_v (exact when x is integral);
 * - allDifferent → per key, the holders' count c_k = Σ x; hard: c_k ≤ 1; soft penalty p per
 *   colliding pair: −p·c(c−1)/2 is concave, encoded by its tangent lines (hypograph);
 * - sameKey / sparsePair → per key, z = Σ_{v with that key} x; products z_a·z_b linearised
 *   (y ≤ z_a, y ≤ z_b for positive scores, y ≥ z_a + z_b − 1 for negative ones, z_a + z_b ≤ 1
 *   for −∞); a sparsePair with a −∞ default gets key-level marginals instead;
 * - counting → s = Σ w·x; if the finite part of score(s) is an interval on which the score is
 *   concave: bounds on s and the hypograph t ≤ f(j) + (f(j+1) − f(j))(s − j) (exact for a
 *   maximised concave function of an integer); otherwise a one-hot z_s over the finite sums
 *   with Σ s·z_s = s.
 * The LP relaxation of this MIP is a valid upper bound too (`relax: true` drops integrality).
 */
import type { CountingFactor, Model, Variable } from '../model/types';
import { countingMaxSum, countingScoreAt, keyOf, score as modelScore } from '../model';

export interface MipEncoding {
  lp: string;
  /** Column name of x_i_v, or undefined when the value is forbidden. */
  xName: (i: number, v: number) => string | undefined;
  constant: number;
  columns: number;
  rows: number;
}

type Term = [number, string];

/** Sums with at most this many values use a one-hot when the score is not concave. */
const ONE_HOT_MAX = 64;

/** Encode a model as a maximisation MIP in CPLEX LP format. */
export function encodeMip(model: Model, opts: { relax?: boolean } = {}): MipEncoding {
  const vars = model.variables;
  const obj = new Map<string, number>();
  const rows: string[] = [];
  const binaries: string[] = [];
  const free: string[] = [];
  const upper: string[] = [];
  let constant = model.constant ?? 0;
  let aux = 0;
  const addObj = (name: string, c: number) => {
    if (c !== 0) obj.set(name, (obj.get(name) ?? 0) + c);
  };
  const num = (c: number) => {
    // LP format wants finite decimals; 15 significant digits keep sums exact enough
    const s = Number(c.toPrecision(15)).toString();
    return s.includes('e') ? c.toFixed(12) : s;
  };
  const row = (terms: Term[], sense: '<=' | '>=' | '=', rhs: number) => {
    const merged = new Map<string, number>();
    for (const [c, n] of terms) if (c !== 0) merged.set(n, (merged.get(n) ?? 0) + c);
    const parts: string[] = [];
    for (const [n, c] of merged) if (c !== 0) parts.push(`${c < 0 ? '-' : '+'} ${num(Math.abs(c))} ${n}`);
    if (parts.length === 0) {
      const ok = sense === '<=' ? 0 <= rhs + 1e-9 : sense === '>=' ? 0 >= rhs - 1e-9 : Math.abs(rhs) < 1e-9;
      if (!ok) parts.push('+ 1 infeasible_marker'), (rhs = sense === '<=' ? -1 : sense === '>=' ? 2 : 0.5);
      else return;
    }
    const lines: string[] = [];
    for (let k = 0; k < parts.length; k += 8) lines.push(parts.slice(k, k + 8).join(' '));
    rows.push(` r${rows.length}: ${lines.join('\n   ')} ${sense} ${num(rhs)}`);
  };

  // hard unaries first: which values are forbidden
  const forbidden = vars.map((v) => new Uint8Array(v.cardinality));
  for (const f of model.factors)
    if (f.kind === 'unary') for (let x = 0; x < vars[f.v]!.cardinality; x++) if (f.table[x] === -Infinity) forbidden[f.v]![x] = 1;
  const xName = (i: number, v: number) => (forbidden[i]![v] ? undefined : `x${i}_${v}`);
  vars.forEach((v, i) => {
    const t: Term[] = [];
    for (let x = 0; x < v.cardinality; x++) {
      const n = xName(i, x);
      if (n) {
        t.push([1, n]);
        binaries.push(n);
      }
    }
    row(t, '=', 1);
  });
  /** Terms of the indicator "variable i has key k". */
  const keyTerms = (i: number, k: number): Term[] => {
    const v: Variable = vars[i]!;
    const t: Term[] = [];
    for (let x = 0; x < v.cardinality; x++) if (keyOf(v, x) === k && xName(i, x)) t.push([1, xName(i, x)!]);
    return t;
  };
  const keysOf = (i: number): Set<number> => {
    const s = new Set<number>();
    for (let x = 0; x < vars[i]!.cardinality; x++) if (keyOf(vars[i]!, x) >= 0 && xName(i, x)) s.add(keyOf(vars[i]!, x));
    return s;
  };
  const scaled = (t: Term[], c: number): Term[] => t.map(([a, n]) => [a * c, n]);
  const fresh = (prefix: string) => `${prefix}${aux++}`;
  /** Objective `w` on the product of two 0/1 sums (w may be −∞: not both). */
  const product = (za: Term[], zb: Term[], w: number) => {
    if (w === 0 || za.length === 0 || zb.length === 0) return;
    if (w === -Infinity) return row([...za, ...zb], '<=', 1);
    const y = fresh('y');
    upper.push(` 0 <= ${y} <= 1`);
    if (w > 0) {
      row([[1, y], ...scaled(za, -1)], '<=', 0);
      row([[1, y], ...scaled(zb, -1)], '<=', 0);
    } else row([[1, y], ...scaled(za, -1), ...scaled(zb, -1)], '>=', -1);
    addObj(y, w);
  };
  /** score(s) of a concave-on-an-interval function, or a one-hot; s given as terms. */
  const sumScore = (sTerms: Term[], maxSum: number, f: (s: number) => number) => {
    const vals: number[] = [];
    for (let s = 0; s <= maxSum; s++) vals.push(f(s));
    const finite = vals.map((v, s) => (v > -Infinity ? s : -1)).filter((s) => s >= 0);
    if (finite.length === 0) return row([], '=', 1); // impossible whatever the assignment
    const lo = finite[0]!;
    const hi = finite[finite.length - 1]!;
    const interval = finite.length === hi - lo + 1;
    let concave = interval;
    for (let s = lo + 1; concave && s < hi; s++) if (vals[s + 1]! - vals[s]! > vals[s]! - vals[s - 1]! + 1e-12) concave = false;
    if (concave) {
      if (lo > 0) row(sTerms, '>=', lo);
      if (hi < maxSum) row(sTerms, '<=', hi);
      if (lo === hi) return void (constant += vals[lo]!);
      let constantF = true;
      for (let s = lo; s <= hi; s++) if (vals[s] !== vals[lo]) constantF = false;
      if (constantF) return void (constant += vals[lo]!);
      const t = fresh('t');
      free.push(t);
      let lastSlope = NaN;
      for (let j = lo; j < hi; j++) {
        const slope = vals[j + 1]! - vals[j]!;
        if (slope === lastSlope) continue;
        lastSlope = slope;
        // t ≤ f(j) + slope·(s − j)
        row([[1, t], ...scaled(sTerms, -slope)], '<=', vals[j]! - slope * j);
      }
      addObj(t, 1);
      return;
    }
    // concave on [lo, c], then constant f(c) up to hi (a soft table cut where hard factors elsewhere
    // stop the sum): a binary b = [s > c], exact with big-M rows
    let c = lo;
    while (c + 1 <= hi && (c === lo || vals[c + 1]! - vals[c]! <= vals[c]! - vals[c - 1]! + 1e-12)) c++;
    let flatTail = c < hi;
    for (let s2 = c; flatTail && s2 <= hi; s2++) if (vals[s2] !== vals[c]) flatTail = false;
    // back off to the last point before the flat run starts
    while (flatTail && c > lo && vals[c - 1] === vals[c]) c--;
    if (interval && flatTail && c > lo && c - lo + 2 <= ONE_HOT_MAX) {
      // one-hot over lo..c plus one "tail" state for c+1..hi (its sum in u, (c+1)·z ≤ u ≤ hi·z):
      // exact, and its LP relaxation is as tight as a full one-hot
      const z: Term[] = [];
      const link: Term[] = [...scaled(sTerms, -1)];
      for (let k = lo; k <= c; k++) {
        const n = fresh('z');
        binaries.push(n);
        z.push([1, n]);
        link.push([k, n]);
        addObj(n, vals[k]!);
      }
      const zt = fresh('z');
      binaries.push(zt);
      z.push([1, zt]);
      addObj(zt, vals[c]!);
      const u = fresh('u');
      link.push([1, u]);
      row([[1, u], [-hi, zt]], '<=', 0);
      row([[1, u], [-(c + 1), zt]], '>=', 0);
      row(z, '=', 1);
      row(link, '=', 0);
      return;
    }
    if (interval && flatTail && c > lo) {
      if (lo > 0) row(sTerms, '>=', lo);
      if (hi < maxSum) row(sTerms, '<=', hi);
      const b = fresh('b');
      binaries.push(b);
      const t = fresh('t');
      free.push(t);
      let fmin = Infinity, fmax = -Infinity;
      for (let s2 = lo; s2 <= hi; s2++) (fmin = Math.min(fmin, vals[s2]!)), (fmax = Math.max(fmax, vals[s2]!));
      const M = fmax - fmin + 1 + Math.abs(fmax) + Math.abs(fmin);
      // b = 0 → s ≤ c; b = 1 → s ≥ c + 1
      row([...sTerms, [-(maxSum - c), b]], '<=', c);
      row([...sTerms, [-(c + 1), b]], '>=', 0);
      let lastSlope = NaN;
      for (let j = lo; j < c; j++) {
        const slope = vals[j + 1]! - vals[j]!;
        if (slope === lastSlope) continue;
        lastSlope = slope;
        // t ≤ f(j) + slope·(s − j) + M·b (slopes can be large, so M grows with the reach of s)
        const Mj = M + Math.abs(slope) * maxSum;
        row([[1, t], ...scaled(sTerms, -slope), [-Mj, b]], '<=', vals[j]! - slope * j);
      }
      // t ≤ f(c) + M·(1 − b)
      row([[1, t], [M, b]], '<=', vals[c]! + M);
      row([[1, t]], '<=', fmax);
      addObj(t, 1);
      return;
    }
    const z: Term[] = [];
    const link: Term[] = [...scaled(sTerms, -1)];
    for (const s of finite) {
      const n = fresh('z');
      binaries.push(n);
      z.push([1, n]);
      link.push([s, n]);
      addObj(n, vals[s]!);
    }
    row(z, '=', 1);
    row(link, '=', 0);
  };

  model.factors.forEach((f) => {
    switch (f.kind) {
      case 'unary':
        for (let x = 0; x < vars[f.v]!.cardinality; x++) {
          const n = xName(f.v, x);
          if (n) addObj(n, f.table[x]!);
        }
        return;
      case 'pairwise':
      case 'table': {
        const scope = f.kind === 'pairwise' ? [f.a, f.b] : f.vars;
        const cards = scope.map((i) => vars[i]!.cardinality);
        const size = cards.reduce((a, b) => a * b, 1);
        const marg = scope.map((i) => vars[i]!.cardinality).map((k) => Array.from({ length: k }, (): Term[] => []));
        const idx = new Array<number>(scope.length).fill(0);
        for (let e = 0; e < size; e++) {
          const sc = f.table[e]!;
          if (sc > -Infinity && idx.every((x, j) => xName(scope[j]!, x))) {
            const m = fresh('m');
            upper.push(` 0 <= ${m} <= 1`);
            addObj(m, sc);
            idx.forEach((x, j) => marg[j]![x]!.push([1, m]));
          }
          for (let j = scope.length - 1; j >= 0; j--) {
            if (++idx[j]! < cards[j]!) break;
            idx[j] = 0;
          }
        }
        scope.forEach((i, j) => {
          for (let x = 0; x < cards[j]!; x++) {
            const n = xName(i, x);
            row([...marg[j]![x]!, ...(n ? ([[-1, n]] as Term[]) : [])], '=', 0);
          }
        });
        return;
      }
      case 'allDifferent': {
        const p = f.penalty ?? -Infinity;
        const keys = new Set<number>();
        for (const i of f.vars) for (const k of keysOf(i)) keys.add(k);
        for (const k of keys) {
          const t = f.vars.flatMap((i) => keyTerms(i, k));
          if (t.length < 2) continue;
          if (p === -Infinity) row(t, '<=', 1);
          else if (p !== 0) sumScore(t, t.length, (c) => (p * c * (c - 1)) / 2);
        }
        return;
      }
      case 'sameKey': {
        const kb = keysOf(f.b);
        for (const k of keysOf(f.a)) if (kb.has(k)) product(keyTerms(f.a, k), keyTerms(f.b, k), f.weight);
        return;
      }
      case 'sparsePair': {
        if (f.default > -Infinity) {
          constant += f.default;
          for (const [ka, kb, sc] of f.entries) product(keyTerms(f.a, ka), keyTerms(f.b, kb), sc - f.default);
          return;
        }
        // only listed key pairs allowed: key-level marginals
        const ma = new Map<number, Term[]>();
        const mb = new Map<number, Term[]>();
        for (const [ka, kb, sc] of f.entries) {
          if (sc === -Infinity) continue;
          const m = fresh('m');
          upper.push(` 0 <= ${m} <= 1`);
          addObj(m, sc);
          (ma.get(ka) ?? ma.set(ka, []).get(ka)!).push([1, m]);
          (mb.get(kb) ?? mb.set(kb, []).get(kb)!).push([1, m]);
        }
        const allKeys = (i: number) => new Set(Array.from({ length: vars[i]!.cardinality }, (_, x) => keyOf(vars[i]!, x)));
        for (const k of allKeys(f.a)) row([...(ma.get(k) ?? []), ...scaled(keyTerms(f.a, k), -1)], '=', 0);
        for (const k of allKeys(f.b)) row([...(mb.get(k) ?? []), ...scaled(keyTerms(f.b, k), -1)], '=', 0);
        return;
      }
      case 'counting': {
        const cf = f as CountingFactor;
        const sTerms: Term[] = [];
        cf.vars.forEach((i, j) => {
          for (const [x, w] of cf.weights[j]!) {
            const n = xName(i, x);
            if (n && w) sTerms.push([w, n]);
          }
        });
        sumScore(sTerms, countingMaxSum(cf), (s) => countingScoreAt(cf, s));
        return;
      }
    }
  });

  const objTerms: string[] = [];
  for (const [n, c] of obj) objTerms.push(`${c < 0 ? '-' : '+'} ${num(Math.abs(c))} ${n}`);
  if (objTerms.length === 0) objTerms.push('+ 0 x0_0');
  const lines: string[] = ['Maximize', ' obj:'];
  for (let k = 0; k < objTerms.length; k += 8) lines.push('  ' + objTerms.slice(k, k + 8).join(' '));
  const relaxed = opts.relax ? binaries.map((n) => ` 0 <= ${n} <= 1`) : [];
  // (concat, not spread: large models have more rows than a call's argument limit)
  lines.push('Subject To');
  for (const part of [rows, ['Bounds'], upper, relaxed, free.map((n) => ` ${n} free`)]) for (const l of part) lines.push(l);
  if (!opts.relax && binaries.length) {
    lines.push('Binary');
    for (let k = 0; k < binaries.length; k += 12) lines.push(' ' + binaries.slice(k, k + 12).join(' '));
  }
  lines.push('End');
  const lp = lines.join('\n');
  return { lp, xName, constant, columns: binaries.length + free.length + upper.length, rows: rows.length };
}

export interface HighsReference {
  status: string;
  /** Best integer solution's score (MAP value when status is Optimal), −∞ if none. */
  score: number;
  /** HiGHS's proven upper bound (equal to score when Optimal). */
  bound: number;
  assignment: number[] | null;
  timeMs: number;
}

/** The two calls of a HiGHS model that put a roster into it and read one back. */
type MipColumns = { getColByName(name: string): number; setSolution(s: { indices: Int32Array; values: Float64Array }): unknown };

/** Start the MIP from `x` (a value index per model variable): each x_i_v column 1 when v is x[i], else 0. */
export function setMipStart(enc: MipEncoding, model: Model, mip: MipColumns, x: ArrayLike<number>): void {
  const idx: number[] = [];
  const val: number[] = [];
  model.variables.forEach((v, i) => {
    for (let a = 0; a < v.cardinality; a++) {
      const n = enc.xName(i, a);
      const c = n ? mip.getColByName(n) : -1;
      if (c >= 0) idx.push(c), val.push(a === x[i] ? 1 : 0);
    }
  });
  mip.setSolution({ indices: Int32Array.from(idx), values: Float64Array.from(val) });
}

/** The MIP's solution as a value index per variable (the value with the largest column; `fallback[i]` when none is above −1). */
export function readMipAssignment(enc: MipEncoding, model: Model, mip: MipColumns, col: Float64Array, fallback: ArrayLike<number>): number[] {
  return model.variables.map((v, i) => {
    let best = fallback[i]!;
    let bv = -1;
    for (let a = 0; a < v.cardinality; a++) {
      const n = enc.xName(i, a);
      const c = n ? mip.getColByName(n) : -1;
      const p = c >= 0 ? col[c]! : -1;
      if (p > bv) (bv = p), (best = a);
    }
    return best;
  });
}

type HighsModel = {
  options: { set(values: Record<string, unknown>): unknown };
  info: { get(name: string): number | bigint };
  run(): { modelStatus: number };
  getSolution(): { colValue: Float64Array };
  getObjectiveValue(): number;
  getColByName(name: string): number;
  setSolution(s: { indices: Int32Array; values: Float64Array }): unknown;
  dispose(): void;
};
type HighsLike = {
  createModel(source: { format: 'lp'; data: string }): HighsModel;
  constants: { modelStatus: Record<string, number> };
};
let highsPromise: Promise<HighsLike> | null = null;
/** The HiGHS WebAssembly instance (loaded once). */
export function loadHighs(): Promise<HighsLike> {
  highsPromise ??= import('highs').then((m) => (m.default as unknown as () => Promise<HighsLike>)());
  return highsPromise;
}

/**
 * MAP by HiGHS. `relax: true` solves the LP relaxation instead (its value is an upper bound).
 * The score of HiGHS's integer solution is recomputed with the model's own scorer and must
 * agree with HiGHS's objective (a mismatch throws, so an encoding bug cannot pass silently).
 */
export async function highsOptimum(
  model: Model,
  opts: { timeLimitS?: number; relax?: boolean; mipRelGap?: number; /** a known assignment as a MIP start (HiGHS completes the other columns) */ start?: ArrayLike<number> } = {},
): Promise<HighsReference> {
  const highs = await loadHighs();
  const enc = encodeMip(model, { relax: opts.relax });
  const t0 = Date.now();
  const m = highs.createModel({ format: 'lp', data: enc.lp });
  try {
    m.options.set({ time_limit: opts.timeLimitS ?? 60, output_flag: false, mip_rel_gap: opts.mipRelGap ?? 1e-9, mip_abs_gap: 1e-7 });
    if (opts.start && !opts.relax) {
      const idx: number[] = [];
      const val: number[] = [];
      model.variables.forEach((v, i) => {
        for (let x = 0; x < v.cardinality; x++) {
          const n = enc.xName(i, x);
          if (n) idx.push(m.getColByName(n)), val.push(x === opts.start![i] ? 1 : 0);
        }
      });
      m.setSolution({ indices: Int32Array.from(idx), values: Float64Array.from(val) });
    }
    const { modelStatus } = m.run();
    const timeMs = Date.now() - t0;
    const name = Object.entries(highs.constants.modelStatus).find(([, v]) => v === modelStatus)?.[0] ?? String(modelStatus);
    const optimal = modelStatus === highs.constants.modelStatus.optimal;
    if (modelStatus === highs.constants.modelStatus.infeasible) return { status: name, score: -Infinity, bound: -Infinity, assignment: null, timeMs };
    if (opts.relax) {
      if (!optimal) return { status: name, score: NaN, bound: Infinity, assignment: null, timeMs };
      return { status: name, score: NaN, bound: m.getObjectiveValue() + enc.constant, assignment: null, timeMs };
    }
    const dual = Number(m.info.get('mip_dual_bound'));
    const bound = Number.isFinite(dual) ? dual + enc.constant : Infinity;
    const primalStatus = Number(m.info.get('primal_solution_status'));
    if (primalStatus !== 2) return { status: name, score: -Infinity, bound, assignment: null, timeMs };
    const col = m.getSolution().colValue;
    const objective = m.getObjectiveValue() + enc.constant;
    const assignment = model.variables.map((v, i) => {
      let best = 0;
      let bv = -1;
      for (let x = 0; x < v.cardinality; x++) {
        const n = enc.xName(i, x);
        const at = n ? m.getColByName(n) : -1;
        const p = at >= 0 ? col[at]! : -1;
        if (p > bv) (bv = p), (best = x);
      }
      return best;
    });
    const score = modelScore(model, assignment);
    // at an optimum the auxiliary columns are tight, so the objective is the model score; a
    // time-limited incumbent may leave them slack (objective ≤ score), never above it
    const tol = 1e-5 * Math.max(1, Math.abs(score));
    if (optimal ? Math.abs(score - objective) > tol : objective > score + tol)
      throw new Error(`HiGHS objective ${objective} disagrees with the model score ${score} of its solution (${name})`);
    return { status: name, score, bound: Number.isFinite(bound) ? Math.max(bound, score) : optimal ? score : Infinity, assignment, timeMs };
  } finally {
    m.dispose();
  }
}
