import { describe, expect, it } from 'vitest';
import { createRandom, deriveSeed } from './random.js';

describe('createRandom', () => {
  it('repeats its sequence for a seed and differs for another', () => {
    const a = createRandom(42);
    const b = createRandom(42);
    const c = createRandom(43);
    const sa = Array.from({ length: 100 }, () => a.uniform());
    expect(Array.from({ length: 100 }, () => b.uniform())).toEqual(sa);
    expect(Array.from({ length: 100 }, () => c.uniform())).not.toEqual(sa);
  });

  it('draws uniforms on [0, 1) with mean 1/2 and variance 1/12, normals with mean 0 and variance 1 (to 4 standard errors)', () => {
    const r = createRandom(1);
    const n = 200_000;
    const u = Array.from({ length: n }, () => r.uniform());
    const z = Array.from({ length: n }, () => r.normal());
    const mean = (x: number[]) => x.reduce((s, v) => s + v, 0) / x.length;
    const variance = (x: number[]) => {
      const m = mean(x);
      return x.reduce((s, v) => s + (v - m) ** 2, 0) / (x.length - 1);
    };
    expect(u.reduce((m, v) => Math.min(m, v), 1)).toBeGreaterThanOrEqual(0);
    expect(u.reduce((m, v) => Math.max(m, v), 0)).toBeLessThan(1);
    expect(Math.abs(mean(u) - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(variance(u) - 1 / 12)).toBeLessThan(0.002);
    expect(Math.abs(mean(z))).toBeLessThan(4 / Math.sqrt(n));
    expect(Math.abs(variance(z) - 1)).toBeLessThan(4 * Math.sqrt(2 / n));
  });

  it('gives whole numbers in [low, high] and log-uniform draws in their range', () => {
    const r = createRandom(3);
    const ints = new Set(Array.from({ length: 1000 }, () => r.integer(1, 3)));
    expect([...ints].sort()).toEqual([1, 2, 3]);
    for (let i = 0; i < 1000; i++) {
      const x = r.logBetween(0.5, 10);
      expect(x).toBeGreaterThanOrEqual(0.5);
      expect(x).toBeLessThan(10);
    }
  });

  it('derives stable sub-seeds by label', () => {
    expect(deriveSeed(7, 'case-3')).toBe(deriveSeed(7, 'case-3'));
    expect(deriveSeed(7, 'case-3')).not.toBe(deriveSeed(7, 'case-4'));
    expect(() => createRandom(Number.NaN)).toThrow(/seed/);
  });
});
