import { describe, expect, it } from 'vitest';
import { landingPoint, type PointLatest } from './landing-point.js';

const p = (pointId: string, zone: PointLatest['zone'], v: number, fault?: [string, number]): PointLatest => ({
  pointId,
  zone,
  velocityRmsMmPerS: v,
  topHypothesis: fault ? { fault: fault[0], component: 'c', score: fault[1] } : null,
});

describe('landingPoint', () => {
  it('opens on the worst zone, not on the first point (the conveyor of the demo: zone D at the output)', () => {
    const latest = [p('gb-input-h', 'A', 0.74, ['gear-broken-tooth', 0.51]), p('gb-intermediate-a', 'A', 1.15, ['gear-broken-tooth', 0.67]), p('gb-output-v', 'D', 12.4, ['gear-missing-tooth', 0.75])];
    expect(landingPoint(latest)).toEqual({ pointId: 'gb-output-v', hypothesis: 'gear-missing-tooth:c' });
  });

  it('breaks a tie of zones by the fault the recording shows, then by the overall level', () => {
    expect(landingPoint([p('motor-de-h', 'C', 5.1, ['bearing-outer-race', 0.75]), p('fan-de-h', 'C', 5.4, ['bearing-outer-race', 0.98])])?.pointId).toBe('fan-de-h');
    expect(landingPoint([p('a', 'B', 2, ['unbalance', 0.3]), p('b', 'B', 3, ['unbalance', 0.2])])).toEqual({ pointId: 'b', hypothesis: null });
    expect(landingPoint([p('a', 'B', 9, ['unbalance', 0.2]), p('b', 'B', 3, ['misalignment', 0.6])])?.pointId).toBe('b');
  });

  it('has nothing to open without a recording', () => {
    expect(landingPoint([])).toBeNull();
  });
});
