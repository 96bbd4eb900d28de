import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { unitErrorDescriptions } from '../units/unit-error.js';
import { spectraErrorDescriptions } from './spectra-error.js';

const dir = (area: string) => new URL(`../${area}/`, import.meta.url);

function thrownCodes(area: string, fn: string): Set<string> {
  const codes = new Set<string>();
  for (const name of readdirSync(dir(area))) {
    if (!name.endsWith('.ts') || name.endsWith('.test.ts')) continue;
    const text = readFileSync(new URL(name, dir(area)), 'utf8');
    for (const m of text.matchAll(new RegExp(`${fn}\\(\\s*'([a-z_]+)'`, 'g'))) codes.add(m[1]);
  }
  return codes;
}

describe('spectraErrorDescriptions', () => {
  it('lists every code the spectra and units areas throw, and nothing unused', () => {
    const used = new Set([...thrownCodes('spectra', 'spectraError')]);
    expect([...used].sort()).toEqual(Object.keys(spectraErrorDescriptions).filter((c) => used.has(c)).sort());
    for (const c of used) expect(spectraErrorDescriptions).toHaveProperty(c);
    const unitUsed = new Set([...thrownCodes('units', 'unitError'), ...thrownCodes('spectra', 'unitError')]);
    for (const c of unitUsed) expect(unitErrorDescriptions).toHaveProperty(c);
    for (const c of Object.keys(unitErrorDescriptions)) expect(unitUsed.has(c)).toBe(true);
    for (const c of Object.keys(spectraErrorDescriptions)) expect(used.has(c)).toBe(true);
  });
});
