// The judge's equivalences: what counts as naming the labelled fault (tests/eval/judge.ts).
import { readFileSync } from 'node:fs';
import { loadMachineModel } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { judgeHypothesis } from './judge.js';

const load = (name: string) => loadMachineModel(readFileSync(new URL(`../../fixtures/machines/${name}.json`, import.meta.url), 'utf8'));
const label = (fault: string, component: string) => ({ faults: [{ fault, component, severity: 0.8 }], speedRpm: null, speedGiven: false });

describe('judgeHypothesis', () => {
  // Common practice: the two gears of a 1:1 pair share the mesh and the shaft speed, so no spectrum tells their tooth
  // faults apart; the bearing rule (identical geometry on one shaft) is the same idea.
  it('counts a tooth fault named on the other gear of a 1:1 pair as equivalent, flagged', () => {
    const blower = load('skelmere-aeration-blower-1');
    const same = judgeHypothesis(blower, { fault: 'gear-missing-tooth', component: 'drive-timing-gear', score: 0.9 }, label('gear-missing-tooth', 'idle-timing-gear'));
    expect(same.verdict).toBe('equivalent');
    expect(same.flag).toBe('identical gear');
    const other = judgeHypothesis(blower, { fault: 'gear-broken-tooth', component: 'drive-timing-gear', score: 0.9 }, label('gear-missing-tooth', 'idle-timing-gear'));
    expect(other.verdict).toBe('equivalent');
    expect(other.flag).toBe('tooth fault, identical gear');
  });

  it('keeps gears of a reducing stage apart: a tooth fault on the wrong one is false', () => {
    const conveyor = load('skelmere-conveyor-drive-2');
    const wrong = judgeHypothesis(conveyor, { fault: 'gear-missing-tooth', component: 'hs-wheel', score: 0.9 }, label('gear-missing-tooth', 'ls-pinion'));
    expect(wrong.verdict).toBe('false');
  });
});
