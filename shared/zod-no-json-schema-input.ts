// Stands in for zod's `classic/from-json-schema.js` in the app bundle (metro.config.cjs). The app
// never turns a JSON Schema into a zod schema, and `z.fromJSONSchema` (12 KiB minified) would
// otherwise ride in the chunk every first screen loads: zod's `z` namespace keeps all it exports.
export function fromJSONSchema(): never {
  throw new Error('z.fromJSONSchema is left out of the web bundle (metro.config.cjs)');
}
