import { describe, expect, it } from 'vitest';
import type { ComponentLine } from './component-lines.js';
import { flagLines } from './line-flags.js';

const at = (frequencyHz: number, component: string, label: string): ComponentLine => ({
  frequencyHz, order: frequencyHz / 25, label, component, componentKind: 'shaft', family: 'shaft-harmonic', harmonic: 1,
  formula: '', scalesWithSpeed: true,
});

describe('flagLines', () => {
  it('marks lines at or above half the sample rate', () => {
    const flagged = flagLines([at(100, 'a', 'x'), at(512, 'a', 'y'), at(600, 'a', 'z')], { sampleRateHz: 1024, frequencyResolutionHz: 1 });
    expect(flagged.map((l) => l.aboveNyquist)).toEqual([false, true, true]);
  });

  it('marks lines of different components closer than the resolution, both ways, and keeps the input order', () => {
    const lines = [at(300, 'gear', 'GMF'), at(100, 'shaft', '4× motor'), at(100.4, 'bearing', 'BPFO'), at(100.9, 'bearing', 'BPFO+1'), at(101.2, 'shaft', 'other')];
    const flagged = flagLines(lines, { sampleRateHz: 2000, frequencyResolutionHz: 0.5 });
    expect(flagged.map((l) => l.label)).toEqual(lines.map((l) => l.label));
    expect(flagged.map((l) => l.ambiguousWith)).toEqual([[], ['BPFO'], ['4× motor'], ['other'], ['BPFO+1']]);
    expect(flagged[0]!.ambiguous).toBe(false);
  });

  it('does not call two lines of one component ambiguous', () => {
    const flagged = flagLines([at(50, 'a', 'p'), at(50.1, 'a', 'q')], { sampleRateHz: 1000, frequencyResolutionHz: 1 });
    expect(flagged.every((l) => !l.ambiguous)).toBe(true);
  });

  it('refuses a non-positive sample rate or resolution, naming it', () => {
    expect(() => flagLines([], { sampleRateHz: 0, frequencyResolutionHz: 1 })).toThrow(/sampleRateHz/);
    expect(() => flagLines([], { sampleRateHz: 1000, frequencyResolutionHz: -1 })).toThrow(/frequencyResolutionHz/);
  });
});
