import { ensureNpmDependencies, runTs } from './ensure-deps.mjs';

ensureNpmDependencies();
runTs('server/bootstrap/run-tests.ts', process.argv.slice(2));
