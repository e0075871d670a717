/** Public inference API. */
export { solveMap, solveMapSync, relativeGap } from './solve';
export type { MapResult, HistoryPoint, StopReason } from './solve';
export { computeMarginals } from './marginals';
export type { MarginalResult } from './marginals';
export { enumerateModel, exactTreeMap, exactTreeMarginals } from './exact';
export type { EnumerationResult } from './exact';
export { buildEngine, engineScore, isForest, softRange } from './engine';
export type { Engine } from './engine';
export { DEFAULT_MAP_OPTIONS, MAP_PRESETS, DEFAULT_MARGINAL_OPTIONS, resolveMapOptions } from './options';
export type { MapOptions, MapMethod, Progress, MarginalOptions } from './options';
export { improve, rng } from './local-search';
