#!/usr/bin/env node
// The command line (`npm run cli -- …`, `npx --no-install borewave …`): runs the prebuilt bundle,
// rebuilding it first when the sources are newer (scripts/build-cli.mjs).
import { createRequire } from 'node:module';
import { ensureCliBundle } from '../scripts/build-cli.mjs';

createRequire(import.meta.url)(await ensureCliBundle());
