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

/** The HiGHS WebAssembly runtime (instantiated on first use). */
export function loadHighsRuntime(): Promise<HighsRuntime> {
  loading ??= import('highs').then((m) => (m.default as unknown as () => Promise<HighsRuntime>)());
  return loading;
}
