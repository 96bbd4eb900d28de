#!/usr/bin/env node
// Thin launcher: the CLI is compiled to dist/ by `npm run build` (run by `npm ci` through `prepare`).
import { main } from '../dist/main.js';

main(process.argv.slice(2)).then(
  (code) => { process.exitCode = code; },
  (err) => { process.stderr.write(`kinespec: ${err && err.message ? err.message : String(err)}\n`); process.exitCode = 2; },
);
