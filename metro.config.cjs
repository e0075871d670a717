// Expo's Metro defaults, plus redirects that keep zod's unused parts (300 KB of messages in other
// languages, reading and writing JSON Schema, z.compile) out of the web bundle.
const path = require('node:path');
const { getDefaultConfig } = require('expo/metro-config');

const config = getDefaultConfig(__dirname);
const zodDir = `${path.sep}node_modules${path.sep}zod${path.sep}v4${path.sep}`;
const englishOnly = path.join(__dirname, 'shared', 'zod-english-only.ts');
const noJsonSchemaInput = path.join(__dirname, 'shared', 'zod-no-json-schema-input.ts');
const noJsonSchemaOutput = path.join(__dirname, 'shared', 'zod-no-json-schema-output.ts');
// zod's modules behind z.toJSONSchema, `~standard.jsonSchema` and z.compile; each is imported from
// several of zod's own files, so they are matched by where they resolve to.
const jsonSchemaOutput = new Set(['compile.js', 'to-json-schema.js', 'json-schema-processors.js', 'json-schema-generator.js'].map((f) => `${zodDir}core${path.sep}${f}`));

config.resolver.resolveRequest = (context, moduleName, platform) => {
  // zod re-exports its error messages in ~45 languages as `z.locales`; Rotaloom speaks English and
  // never calls z.locales, so its index resolves to English alone (the default zod already sets).
  if (moduleName === '../locales/index.js' && context.originModulePath.includes(zodDir)) {
    return { type: 'sourceFile', filePath: englishOnly };
  }
  // z.fromJSONSchema, which the app never calls (the server's scripts use zod from Node, not this bundle).
  if (moduleName === './from-json-schema.js' && context.originModulePath.endsWith(`${zodDir}classic${path.sep}external.js`)) {
    return { type: 'sourceFile', filePath: noJsonSchemaInput };
  }
  const resolved = context.resolveRequest(context, moduleName, platform);
  if (resolved.type === 'sourceFile' && context.originModulePath.includes(zodDir)) {
    const inZod = resolved.filePath.slice(resolved.filePath.lastIndexOf(zodDir));
    if (jsonSchemaOutput.has(inZod)) return { type: 'sourceFile', filePath: noJsonSchemaOutput };
  }
  return resolved;
};

module.exports = config;
