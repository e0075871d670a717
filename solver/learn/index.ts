export { learnWeights, disagreements } from './learn-weights';
export type { Preference, LearnResult } from './learn-weights';
export { learnableRules, currentWeights, withWeights, makeFeaturizer, scorerTermKeys, FIXED_FEATURES } from './features';
export type { Features, FixedFeature } from './features';
export { replayWithWeights } from './replay';
export type { ReplayResult } from './replay';
export { DEFAULT_LEARN_OPTIONS, LEARN_PRESETS, resolveLearnOptions } from './options';
export type { LearnOptions } from './options';
