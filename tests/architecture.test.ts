import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

// House rule (DEVELOPERS.md, "House rules"): packages are pure computation, no I/O.
const forbidden = /from\s+['"](node:)?(fs|fs\/promises|net|http|https|child_process|dgram|worker_threads)['"]|from\s+['"](fastify|postgres|pino|@electric-sql\/[^'"]+)['"]/;

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return sources(path);
    return path.endsWith('.ts') && !path.endsWith('.test.ts') ? [path] : [];
  });
}

describe('package purity', () => {
  for (const pkg of ['signal', 'kinematics', 'signatures', 'diagnosis', 'forecast']) {
    it(`packages/${pkg}/src imports no I/O module`, () => {
      const offenders = sources(join('packages', pkg, 'src')).filter((f) => forbidden.test(readFileSync(f, 'utf8')));
      expect(offenders).toEqual([]);
    });
  }
});
