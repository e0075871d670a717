/**
 * Compilation of a model into the operators of factor-operators.ts (`buildEngine`), with the
 * engine's own scoring and shape tests. The message state the algorithms update lives apart,
 * in message-state.ts.
 *
 * Hard constraints: every -Infinity is replaced by -H, H above the total range of
 * all soft scores, so that any assignment breaking a hard factor scores below every
 * feasible one. Upper bounds computed on the big-M model are valid for the original
 * model too (feasible assignments score the same; the others only gain).
 */
import { countingMaxSum, countingScoreAt, keyOf, scopeOf, validateModel } from '../model/factor-graph';
import type { Factor, Model } from '../model/types';
import { AtMostOneOp, CountingOp, NEG, PairwiseOp, PottsOp, SparseOp, TableOp, type KeyInfo, type Op, type Scratch } from './factor-operators';

export interface Engine {
  model: Model;
  n: number;
  card: Int32Array;
  /** Summed unary scores per variable (big-M applied). */
  theta: Float64Array[];
  ops: Op[];
  /** Per variable: the operators touching it (adjOp[i][k]) and the variable's slot in each (adjSlot[i][k]). */
  adjOp: Int32Array[];
  adjSlot: Int32Array[];
  keys: KeyInfo;
  scratch: Scratch;
  H: number;
  constant: number;
  /** Number of model factors that forbid something (for reporting). */
  hasHard: boolean;
}

function finiteRange(values: Iterable<number>): number {
  let lo = Infinity, hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return hi >= lo ? hi - lo : 0;
}

const tableCache = new WeakMap<object, number[]>();

/** Scores of a counting factor for every reachable sum 0..max (cached per factor object). */
function countingTable(f: Factor & { kind: 'counting' }): number[] {
  const hit = tableCache.get(f);
  if (hit) return hit;
  const t = countingTableUncached(f);
  tableCache.set(f, t);
  return t;
}

function countingTableUncached(f: Factor & { kind: 'counting' }): number[] {
  if (typeof f.score !== 'function') {
    // a table repeats its last entry: no need to expand past it
    const maxS = Math.min(countingMaxSum(f), Math.max(0, f.score.length - 1));
    const t: number[] = [];
    for (let s = 0; s <= maxS; s++) t.push(countingScoreAt(f, s));
    return t;
  }
  const maxS = countingMaxSum(f);
  const t: number[] = [];
  for (let s = 0; s <= maxS; s++) t.push(countingScoreAt(f, s));
  return t;
}

/** Total soft range of the model: no two feasible assignments differ by more. */
export function softRange(model: Model): number {
  let r = 0;
  for (const f of model.factors) {
    switch (f.kind) {
      case 'unary':
      case 'pairwise':
      case 'table':
        r += finiteRange(Array.from(f.table));
        break;
      case 'sameKey':
        r += Number.isFinite(f.weight) ? Math.abs(f.weight) : 0;
        break;
      case 'allDifferent': {
        const p = f.penalty ?? NEG;
        const pairs = (f.vars.length * (f.vars.length - 1)) / 2;
        r += Number.isFinite(p) ? Math.abs(p) * pairs : 0;
        break;
      }
      case 'sparsePair':
        r += finiteRange([f.default, ...f.entries.map((e) => e[2])]);
        break;
      case 'counting':
        r += finiteRange(countingTable(f));
        break;
    }
  }
  return r;
}

export interface EngineOptions {
  hardPenalty?: number;
}

export function buildEngine(model: Model, opts: EngineOptions = {}): Engine {
  validateModel(model);
  const n = model.variables.length;
  const card = Int32Array.from(model.variables.map((v) => v.cardinality));
  const H = opts.hardPenalty && opts.hardPenalty > 0 ? opts.hardPenalty : Math.max(1000, 4 * softRange(model) + 100);
  const bm = (v: number): number => (v === NEG ? -H : v);
  let hasHard = false;
  const bmt = (t: ArrayLike<number>): Float64Array => {
    const out = new Float64Array(t.length);
    for (let i = 0; i < t.length; i++) {
      if (t[i] === NEG) hasHard = true;
      if (Number.isNaN(t[i]!) || t[i] === Infinity) throw new Error(`score ${t[i]} is not allowed (use finite points or -Infinity)`);
      out[i] = bm(t[i]!);
    }
    return out;
  };

  // dense key groups: 0 = no key; keys k >= 0 map to 1..P
  const keyMap = new Map<number, number>();
  const group: Int32Array[] = [];
  const firstOfGroup: Map<number, number>[] = [];
  const nextSame: Int32Array[] = [];
  for (const v of model.variables) {
    const g = new Int32Array(v.cardinality);
    const first = new Map<number, number>();
    const next = new Int32Array(v.cardinality).fill(-1);
    for (let x = v.cardinality - 1; x >= 0; x--) {
      const k = keyOf(v, x);
      let gi = 0;
      if (k >= 0) {
        gi = keyMap.get(k) ?? 0;
        if (!gi) {
          gi = keyMap.size + 1;
          keyMap.set(k, gi);
        }
      }
      g[x] = gi;
      const f = first.get(gi);
      if (f !== undefined) next[x] = f;
      first.set(gi, x);
    }
    group.push(g);
    firstOfGroup.push(first);
    nextSame.push(next);
  }
  const numGroups = keyMap.size + 1;
  const keys: KeyInfo = { group, firstOfGroup, nextSame, numGroups };
  const scratch: Scratch = {
    groupA: new Float64Array(numGroups),
    stamp: new Int32Array(numGroups),
    stampNow: { v: 0 },
    dp: new Float64Array(1024),
  };
  const groupOfKey = (k: number): number => (k < 0 ? 0 : keyMap.get(k) ?? -1);

  const theta = model.variables.map((v) => new Float64Array(v.cardinality));
  const ops: Op[] = [];
  const countingOp = (fi: number, vars: number[], weights: Array<Array<[number, number]>>, table: number[]): CountingOp | null => {
    // typed arrays filled in one pass: these factors can span thousands of seats
    const n = weights.length;
    let total = 0;
    for (let j = 0; j < n; j++) total += weights[j]!.length;
    const vsA = new Int32Array(n), offA = new Int32Array(n + 1), supA = new Int32Array(total), wtsA = new Int32Array(total);
    let nv = 0, ne = 0;
    for (let j = 0; j < n; j++) {
      const ws = weights[j]!;
      if (ws.length === 1) {
        // common case: one weighted value (e.g. this seat taken by the factor's person)
        const p = ws[0]!;
        if (p[1] > 0) {
          vsA[nv++] = vars[j]!;
          supA[ne] = p[0];
          wtsA[ne++] = p[1];
          offA[nv] = ne;
        }
        continue;
      }
      const m = new Map<number, number>();
      for (const [x, w] of ws) if (w > 0) m.set(x, (m.get(x) ?? 0) + w);
      if (m.size === 0) continue; // weighs 0 whatever its value: not part of the sum
      vsA[nv++] = vars[j]!;
      for (const x of [...m.keys()].sort((p, q) => p - q)) {
        supA[ne] = x;
        wtsA[ne++] = m.get(x)!;
      }
      offA[nv] = ne;
    }
    const vs = vsA.subarray(0, nv), off = offA.subarray(0, nv + 1), sup = supA.subarray(0, ne), wts = wtsA.subarray(0, ne);
    // clamp sums where the score stays constant from there on
    let lastSum = table.length - 1;
    while (lastSum > 0 && table[lastSum - 1] === table[lastSum]) lastSum--;
    const g = bmt(table.slice(0, lastSum + 1));
    if (nv === 0) {
      constant += g[0]!;
      return null;
    }
    const op = new CountingOp(fi, vs, off, sup, wts, card, g, scratch);
    op.H = H;
    if (g.some((_, t) => table[t] === NEG)) {
      // distance of each forbidden sum to the nearest allowed one
      const lt = Float64Array.from(g);
      const dist = new Float64Array(lastSum + 1).fill(Infinity);
      let last = -Infinity;
      for (let t = 0; t <= lastSum; t++) {
        if (table[t] !== NEG) last = t;
        dist[t] = t - last;
      }
      last = Infinity;
      for (let t = lastSum; t >= 0; t--) {
        if (table[t] !== NEG) last = t;
        dist[t] = Math.min(dist[t]!, last - t);
      }
      for (let t = 0; t <= lastSum; t++) if (table[t] === NEG) lt[t] = -H * (1 + (Number.isFinite(dist[t]!) ? dist[t]! : lastSum + 1));
      op.localTable = lt;
      op.tailHard = table[lastSum] === NEG;
    }
    return op;
  };
  let constant = model.constant ?? 0;

  model.factors.forEach((f, fi) => {
    switch (f.kind) {
      case 'unary': {
        const t = bmt(f.table);
        const th = theta[f.v]!;
        for (let x = 0; x < t.length; x++) th[x]! += t[x]!;
        break;
      }
      case 'pairwise':
        ops.push(new PairwiseOp(fi, f.a, f.b, card[f.a]!, card[f.b]!, bmt(f.table)));
        break;
      case 'table':
        if (f.vars.length === 1) {
          const t = bmt(f.table);
          const th = theta[f.vars[0]!]!;
          for (let x = 0; x < t.length; x++) th[x]! += t[x]!;
        } else if (f.vars.length === 2) ops.push(new PairwiseOp(fi, f.vars[0]!, f.vars[1]!, card[f.vars[0]!]!, card[f.vars[1]!]!, bmt(f.table)));
        else if (f.vars.length === 0) {
          /* constant factor: folded below */
        } else ops.push(new TableOp(fi, f.vars, Int32Array.from(f.vars.map((v) => card[v]!)), bmt(f.table)));
        break;
      case 'sameKey':
        if (f.weight === NEG) hasHard = true;
        if (f.weight !== 0) ops.push(new PottsOp(fi, f.a, f.b, bm(f.weight), keys, scratch));
        break;
      case 'sparsePair': {
        const entries: Array<[number, number, number]> = [];
        for (const [ka, kb, s] of f.entries) {
          const ga = groupOfKey(ka), gb = groupOfKey(kb);
          if (ga < 0 || gb < 0) continue; // key used by no variable: entry can never apply
          if (s === NEG) hasHard = true;
          entries.push([ga, gb, bm(s)]);
        }
        if (f.default === NEG) hasHard = true;
        ops.push(new SparseOp(fi, f.a, f.b, entries, bm(f.default), keys, scratch));
        break;
      }
      case 'allDifferent': {
        const p = f.penalty ?? NEG;
        if (p === NEG) hasHard = true;
        if (f.vars.length === 2) ops.push(new PottsOp(fi, f.vars[0]!, f.vars[1]!, bm(p), keys, scratch));
        else if (f.vars.length > 2) {
          // one counting constraint per key: "at most one holder" (or penalty per colliding pair);
          // counting sort over key groups into typed arrays
          const G = numGroups;
          const nSup = new Int32Array(G), nVar = new Int32Array(G), last = new Int32Array(G).fill(-1);
          for (const v of f.vars) {
            const g = group[v]!;
            for (let x = 0; x < g.length; x++) {
              const gi = g[x]!;
              if (gi === 0) continue;
              nSup[gi]!++;
              if (last[gi] !== v) {
                last[gi] = v;
                nVar[gi]!++;
              }
            }
          }
          const hv: (Int32Array | null)[] = new Array(G).fill(null), ho: (Int32Array | null)[] = new Array(G).fill(null), hs: (Int32Array | null)[] = new Array(G).fill(null);
          const cv = new Int32Array(G), cs = new Int32Array(G);
          for (let gi = 1; gi < G; gi++)
            if (nVar[gi]! >= 2) {
              hv[gi] = new Int32Array(nVar[gi]!);
              ho[gi] = new Int32Array(nVar[gi]! + 1);
              hs[gi] = new Int32Array(nSup[gi]!);
            }
          last.fill(-1);
          for (const v of f.vars) {
            const g = group[v]!;
            for (let x = 0; x < g.length; x++) {
              const gi = g[x]!;
              const vv = hv[gi];
              if (gi === 0 || !vv) continue;
              if (last[gi] !== v) {
                last[gi] = v;
                vv[cv[gi]!++] = v;
              }
              hs[gi]![cs[gi]!++] = x;
              ho[gi]![cv[gi]!] = cs[gi]!;
            }
          }
          for (let gi = 1; gi < G; gi++) {
            const vv = hv[gi];
            if (!vv) continue;
            if (p === NEG) {
              ops.push(new AtMostOneOp(fi, vv, ho[gi]!, hs[gi]!, card, H));
              continue;
            }
            const table: number[] = [];
            for (let c = 0; c <= vv.length; c++) table.push((p * c * (c - 1)) / 2);
            ops.push(new CountingOp(fi, vv, ho[gi]!, hs[gi]!, new Int32Array(hs[gi]!.length).fill(1), card, bmt(table), scratch));
          }
        }
        break;
      }
      case 'counting':
        {
          const op = countingOp(fi, f.vars, f.weights, countingTable(f));
          if (op) ops.push(op);
        }
        break;
    }
  });
  model.factors.forEach((f) => {
    if (f.kind === 'table' && f.vars.length === 0) constant += bm(f.table[0]!);
  });
  // adjacency as typed arrays (counting sort by variable): millions of slots on large rosters
  const deg = new Int32Array(n);
  for (const op of ops) for (let s = 0; s < op.vars.length; s++) deg[op.vars[s]!]!++;
  const adjOp = Array.from(deg, (d) => new Int32Array(d));
  const adjSlot = Array.from(deg, (d) => new Int32Array(d));
  const fill = new Int32Array(n);
  ops.forEach((op, oi) => {
    for (let s = 0; s < op.vars.length; s++) {
      const v = op.vars[s]!, k = fill[v]!++;
      adjOp[v]![k] = oi;
      adjSlot[v]![k] = s;
    }
  });
  return { model, n, card, theta, ops, adjOp, adjSlot, keys, scratch, H, constant, hasHard };
}

/** Big-M score of an assignment through the compiled operators (equals the model score when feasible). */
export function engineScore(engine: Engine, x: Int32Array): number {
  let s = engine.constant;
  for (let i = 0; i < engine.n; i++) s += engine.theta[i]![x[i]!]!;
  for (const op of engine.ops) s += op.score(x);
  return s;
}

/** Log10 of the number of joint assignments. */
export function log10States(engine: Engine): number {
  let s = 0;
  for (let i = 0; i < engine.n; i++) s += Math.log10(engine.card[i]!);
  return s;
}

/** True when the factor graph (variables + operators) has no cycle. */
export function isForest(engine: Engine): boolean {
  // union-find over variable nodes and op nodes
  const parent = new Int32Array(engine.n + engine.ops.length).map((_, i) => i);
  const find = (a: number): number => {
    while (parent[a] !== a) {
      parent[a] = parent[parent[a]!]!;
      a = parent[a]!;
    }
    return a;
  };
  for (let o = 0; o < engine.ops.length; o++) {
    for (const v of engine.ops[o]!.vars) {
      const ra = find(v), rb = find(engine.n + o);
      if (ra === rb) return false;
      parent[ra] = rb;
    }
  }
  return true;
}
