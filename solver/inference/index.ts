/** Public inference API. */
export { solveMap, solveMapSync, autoSolver } from './solve';
export { relativeGap } from './map-solver';
export type { MapResult, MapSolver, HistoryPoint, StopReason } from './map-solver';
export { mplpSolver } from './mplp';
export { maxProductSolver } from './max-product';
export { enumerationSolver, treeSolver } from './exact';
export { computeMarginals } from './marginals';
export type { MarginalResult } from './marginals';
export { enumerateModel, exactTreeMap, exactTreeMarginals } from './exact';
export type { EnumerationResult } from './exact';
export { buildEngine, engineScore, isForest, softRange } from './engine';
export type { Engine } from './engine';
export {
  DEFAULT_MAP_OPTIONS,
  DEFAULT_MPLP_OPTIONS,
  DEFAULT_MAX_PRODUCT_OPTIONS,
  DEFAULT_ENUMERATION_OPTIONS,
  MAP_PRESETS,
  DEFAULT_MARGINAL_OPTIONS,
  resolveMapOptions,
} from './options';
export type { MapOptions, MapMethod, Progress, MarginalOptions, BaseMapOptions, MplpOptions, MaxProductOptions, EnumerationOptions, TreeOptions, LoopyOptions } from './options';
export { improve, rng } from './local-search';
