// Plumbing: the second physics imports no other Kinespec package.
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

// The rig is a second, independent physics: its sources import no other Kinespec package (and so none of the
// predictor's or the simulator's assumptions), and, like every package, no I/O module.
const dir = fileURLToPath(new URL('.', import.meta.url));
function sources(d: string): string[] {
  return readdirSync(d, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? sources(join(d, e.name)) : e.name.endsWith('.ts') && !e.name.endsWith('.test.ts') ? [join(d, e.name)] : []));
}

describe('@kinespec/lumped-rig sources', () => {
  const files = sources(dir);

  it('import nothing but each other', () => {
    expect(files.length).toBeGreaterThan(10);
    for (const f of files) {
      const imports = [...readFileSync(f, 'utf8').matchAll(/\bfrom\s+['"]([^'"]+)['"]/g)].map((m) => m[1]!);
      for (const spec of imports) expect(spec.startsWith('./') || spec.startsWith('../'), `${f} imports ${spec}`).toBe(true);
    }
  });

  it('draw no randomness or time from outside (Math.random, Date, performance)', () => {
    for (const f of files) expect(readFileSync(f, 'utf8')).not.toMatch(/Math\.random|Date\.now|new Date|performance\.now/);
  });
});
