/**
 * The HiGHS LP/MIP solver (npm `highs`, HiGHS compiled to WebAssembly: no native code, no
 * download), loaded once per process. Only the calls the roster bound uses are typed here.
 */

export interface HighsSparse {
  format: 'csc' | 'csr';
  numRows: number;
  numCols: number;
  starts: Int32Array;
  indices: Int32Array;
  values: Float64Array;
}

export type HighsSelection = { kind: 'range'; from: number; to: number } | { kind: 'set'; indices: Int32Array };

export interface HighsPersistentModel {
  options: { set(values: Record<string, unknown>): unknown };
  info: { get(name: string): number | bigint };
  run(): { modelStatus: number };
  getSolution(): { colValue: Float64Array; rowDual: Float64Array; colDual: Float64Array };
  getObjectiveValue(): number;
  getModelStatus(): number;
  /** Drops the basis and solver state, keeping the model (a cold start for the next run). */
  clearSolver(): unknown;
  changeObjectiveSense(sense: unknown): unknown;
  addRows(data: { lower: Float64Array; upper: Float64Array; matrix: HighsSparse }): unknown;
  addCols(data: { cost: Float64Array; lower: Float64Array; upper: Float64Array; matrix: HighsSparse }): unknown;
  changeColsIntegrality(selection: HighsSelection, types: Int32Array): unknown;
  clearIntegrality(): unknown;
  changeColsBounds(selection: HighsSelection, lower: Float64Array, upper: Float64Array): unknown;
  setSolution(s: { indices: Int32Array; values: Float64Array }): unknown;
  dispose(): void;
}

export interface HighsRuntime {
  createModel(source?: { format: 'lp'; data: string }): HighsPersistentModel;
  constants: { modelStatus: Record<string, number>; objectiveSense: { maximize: unknown; minimize: unknown }; variableType: { continuous: number; integer: number } };
}

let loading: Promise<HighsRuntime> | null = null;

/**
 * The HiGHS WebAssembly runtime (instantiated on first use). `baseline` (read on the first call
 * only) keeps its code on V8's baseline compiler, see wasmTiering.
 */
export function loadHighsRuntime(opts: { baseline?: boolean } = {}): Promise<HighsRuntime> {
  loading ??= wasmTiering(opts.baseline === true).then(() => import('highs')).then((m) => (m.default as unknown as () => Promise<HighsRuntime>)());
  return loading;
}

/**
 * Keep HiGHS's WebAssembly on V8's baseline compiler (Liftoff) instead of letting hot functions
 * tier up to TurboFan. A solve thread starts HiGHS cold, and the tier-up compiles on background
 * threads that count against a CPU budget. Measured on 12 people × 2 weeks (CPU, 2026-12-03): the
 * first MIP of a process 2.2 → 0.9 s, LNS reaching the optimum −36.5 at 3.9 → 1.2 s, proven best
 * at 2.0–2.8 s instead of not at all in 4 s; a long MIP once warm is ~30 % slower (2.9 → 3.7 s).
 * On the demo (10 s, LNS for seconds) it costs: 14.75–16.75 against 16.75–17.75 without, so
 * solveRoster asks for it only on rosters small enough for the proof step, and only where asked
 * (`highsBaseline`, off in the product's worker). The flag is process-wide: every load sets it one
 * way or the other, but that is not enough. Measured (12 × 2 weeks' cold MIP, 2026-12-03): in a
 * thread after one that loaded HiGHS on the baseline compiler it takes 3.1–3.25 s even with
 * --no-liftoff-only, as on the baseline itself (2.0–2.8 s in a process that never used it): V8 keeps
 * the compiled module for the whole process.
 */
async function wasmTiering(baseline: boolean): Promise<void> {
  try {
    const v8 = await import('node:v8');
    v8.setFlagsFromString(baseline ? '--liftoff-only' : '--no-liftoff-only');
  } catch {
    // not on Node (or flags frozen): the default tiering stays
  }
}
