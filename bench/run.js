#!/usr/bin/env node
// Runs every benchmark in bench/ one after another and prints their figures.
// Benchmarks are plain scripts (*.bench.js, or *.bench.ts run through tsx); none is run by CI.
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv.slice(2);
const files = readdirSync(here)
  .filter((f) => /\.bench\.(js|ts)$/.test(f))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();
let failed = 0;
for (const file of files) {
  process.stdout.write(`\n== ${file}\n`);
  const args = file.endsWith('.ts') ? ['--import', 'tsx', join(here, file)] : [join(here, file)];
  const r = spawnSync(process.execPath, args, { stdio: 'inherit' });
  if (r.status !== 0) failed++;
}
process.exitCode = failed ? 1 : 0;
