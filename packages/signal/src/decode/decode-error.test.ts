import { readFileSync, readdirSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeErrorCodes, decodeErrorDescriptions } from './decode-error.js';

const here = new URL('./', import.meta.url);

describe('decodeErrorCodes', () => {
  it('lists snake_case codes, each with a description', () => {
    for (const code of decodeErrorCodes) {
      expect(code).toMatch(/^[a-z]+(_[a-z0-9]+)*$/);
      expect(decodeErrorDescriptions[code].length).toBeGreaterThan(10);
    }
  });

  it('holds every code the decoders throw, and each is thrown somewhere', () => {
    const sources = readdirSync(here)
      .filter((f) => f.endsWith('.ts') && !f.endsWith('.test.ts') && f !== 'decode-error.ts')
      .map((f) => readFileSync(new URL(f, here), 'utf8'))
      .join('\n');
    const thrown = new Set([...sources.matchAll(/['"]([a-z]+(?:_[a-z0-9]+)+)['"]/g)].map((m) => m[1]).filter((c) => c in decodeErrorDescriptions));
    expect([...thrown].sort()).toEqual([...decodeErrorCodes].sort());
  });

  it("is documented in the package's README", () => {
    const guide = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
    const missing = decodeErrorCodes.filter((code) => !guide.includes(`\`${code}\``));
    expect(missing).toEqual([]);
  });
});
