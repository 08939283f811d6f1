// Loaded by adapter-node before its handler reads the environment (kit experimental
// instrumentation), so plain `node build` gets working defaults without extra variables.
import { applyServerEnvDefaults } from '$lib/server/env-defaults';

applyServerEnvDefaults(process.env);
