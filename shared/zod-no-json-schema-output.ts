// Stands in for zod's JSON Schema writer (core/to-json-schema.js, core/json-schema-processors.js,
// core/json-schema-generator.js) and its schema compiler (core/compile.js) in the app bundle
// (metro.config.cjs). The app never writes a JSON Schema from a zod schema nor calls `z.compile`
// (shared/roster/write-json-schema.ts runs in Node, with zod as published), yet zod's `z` and
// `z.core` namespaces keep everything they export: about 60 KiB minified in the chunk every
// first screen loads. Each export keeps its name so zod's modules still link; calling one throws.
function leftOut(): never {
  throw new Error("zod's JSON Schema writer and z.compile are left out of the web bundle (metro.config.cjs)");
}

// to-json-schema.js. Every schema builds its `toJSONSchema` and `~standard.jsonSchema` methods
// from these when it is made, so they must return a function; the function throws if called.
export const createToJSONSchemaMethod = () => leftOut;
export const createStandardJSONSchemaMethod = () => leftOut;
export const initializeContext = leftOut, handleUnrepresentable = leftOut, processSchema = leftOut, process = leftOut, extractDefs = leftOut, finalize = leftOut;

// json-schema-processors.js. Schemas call the per-kind processors only while writing a JSON
// Schema; `aggregateChecks` also backs the `minLength`, `maxLength`, `format`, `minValue` …
// getters of string, number and bigint schemas, which the app does not read.
export const toJSONSchema = leftOut, aggregateChecks = leftOut;
export const stringProcessor = leftOut, numberProcessor = leftOut, booleanProcessor = leftOut, bigintProcessor = leftOut, symbolProcessor = leftOut,
  nullProcessor = leftOut, undefinedProcessor = leftOut, voidProcessor = leftOut, neverProcessor = leftOut, anyProcessor = leftOut, unknownProcessor = leftOut,
  dateProcessor = leftOut, enumProcessor = leftOut, literalProcessor = leftOut, nanProcessor = leftOut, templateLiteralProcessor = leftOut, fileProcessor = leftOut,
  successProcessor = leftOut, customProcessor = leftOut, functionProcessor = leftOut, transformProcessor = leftOut, mapProcessor = leftOut, setProcessor = leftOut,
  arrayProcessor = leftOut, objectProcessor = leftOut, unionProcessor = leftOut, intersectionProcessor = leftOut, tupleProcessor = leftOut, recordProcessor = leftOut,
  nullableProcessor = leftOut, nonoptionalProcessor = leftOut, defaultProcessor = leftOut, prefaultProcessor = leftOut, catchProcessor = leftOut, pipeProcessor = leftOut,
  readonlyProcessor = leftOut, promiseProcessor = leftOut, optionalProcessor = leftOut, lazyProcessor = leftOut;
export const allProcessors = {};

// json-schema-generator.js
export class JSONSchemaGenerator {
  constructor() {
    leftOut();
  }
}

// compile.js. zod's parser recognises a compiled validator's failure by this symbol itself
// (core/parse.js), so it keeps its registered value.
export const INVALID = Symbol.for('zod.compile.invalid');
export class ZodCompileAsyncError extends Error {}
export class ZodCompileUnsupportedError extends Error {}
export const compile = leftOut, withParser = leftOut, compileFn = leftOut;
