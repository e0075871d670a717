/** Public model API: types, structure and exact scoring. */
export * from './types';
export {
  ModelError,
  scopeOf,
  keyOf,
  maxKey,
  validateModel,
  factorScore,
  isHardFactor,
  factorsByVariable,
  valueLabel,
  countingMaxSum,
  countingScoreAt,
} from './factor-graph';
export { score, factorContributions, violatedFactors } from './score';
export type { FactorContribution } from './score';
