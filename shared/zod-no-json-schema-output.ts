// Stands in for zod's JSON Schema writer (core/to-json-schema.js, core/json-schema-processors.js,
// core/json-schema-generator.js) and its schema compiler (core/compile.js) in the app bundle
// (metro.config.cjs). The app never writes a JSON Schema from a zod schema nor calls `z.compile`
// (shared/roster/write-json-schema.ts runs in Node, with zod as published), yet zod's `z` and
// `z.core` namespaces keep everything they export: about 60 KiB minified in the chunk every
// first screen loads. Here are only the names zod's own modules read outside the JSON Schema
// writer (and `z.…` exports, so they keep their names); calling any of them throws.
function leftOut(): never {
  throw new Error("zod's JSON Schema writer and z.compile are left out of the web bundle (metro.config.cjs)");
}

// to-json-schema.js. Every schema builds its `toJSONSchema` and `~standard.jsonSchema` methods
// from these when it is made, so they must return a function; the function throws if called.
export const createToJSONSchemaMethod = () => leftOut;
export const createStandardJSONSchemaMethod = () => leftOut;

// json-schema-processors.js. `aggregateChecks` backs the `minLength`, `maxLength`, `format`,
// `minValue` … getters of string, number and bigint schemas, which the app does not read. The
// per-kind processors (`stringProcessor` …) are left undefined: schemas call them only from inside
// toJSONSchema, and each name exported here is also re-exported by zod's `z.core` namespace.
export const toJSONSchema = leftOut, aggregateChecks = leftOut;
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
export const compile = leftOut, withParser = leftOut;
