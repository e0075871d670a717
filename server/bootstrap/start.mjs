import { ensureNpmDependencies, runTs } from './ensure-deps.mjs';

ensureNpmDependencies();
runTs('server/bootstrap/run-start.ts', process.argv.slice(2));
