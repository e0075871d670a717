/** UAI interchange: MARKOV model files and MPE result files (pure text). */
export { parseUai, writeUai, writeUaiWithOffset, writeMpe, parseMpe, UaiError, UAI_MAX_TABLE } from './uai';
export type { UaiParseResult, UaiWriteResult } from './uai';
