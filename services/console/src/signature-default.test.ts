import { describe, expect, it } from 'vitest';
import { defaultCandidate } from './pages/signature-page.js';

const c = (fault: string, component: string) => ({ fault, component });
const blower = [c('unbalance', 'drive-rotor'), c('misalignment', 'idle-rotor'), c('gear-missing-tooth', 'drive-timing-gear'), c('gear-missing-tooth', 'idle-timing-gear')];

describe('defaultCandidate (signature explorer)', () => {
  it('opens on a tooth fault where the machine has gears, not on a weak strongest hypothesis', () => {
    expect(defaultCandidate(blower, { fault: 'misalignment', component: 'idle-rotor', score: 0.19 })).toBe('gear-missing-tooth|drive-timing-gear');
  });
  it('opens on the fault the diagnosis shows, and on the gear of the strongest hypothesis', () => {
    expect(defaultCandidate(blower, { fault: 'misalignment', component: 'idle-rotor', score: 0.7 })).toBe('misalignment|idle-rotor');
    expect(defaultCandidate(blower, { fault: 'gear-wear', component: 'idle-timing-gear', score: 0.2 })).toBe('gear-missing-tooth|idle-timing-gear');
  });
  it('falls back to the strongest hypothesis, then the first candidate, on a machine without gears', () => {
    const fan = [c('unbalance', 'fan'), c('bearing-outer-race', 'fan-de')];
    expect(defaultCandidate(fan, { fault: 'bearing-outer-race', component: 'fan-de', score: 0.3 })).toBe('bearing-outer-race|fan-de');
    expect(defaultCandidate(fan, null)).toBe('unbalance|fan');
    expect(defaultCandidate([], null)).toBeNull();
  });
});
