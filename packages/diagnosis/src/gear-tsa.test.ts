import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { assertMachineModel } from '@kinespec/kinematics';
import { simulateRecording } from '@kinespec/simulator';
import { analyseRecording } from './analyse-recording.js';

// FM4 is the normalised kurtosis of the difference signal (Stewart 1977; Zakrajsek, Townsend & Decker,
// NASA TM-105950, 1993): near 3 for a Gaussian residual, raised by a localised tooth defect. Here the
// direction is checked on simulated recordings of the demo conveyor gearbox with a tach channel.
const model = assertMachineModel(JSON.parse(readFileSync(new URL('../../../fixtures/machines/skelmere-conveyor-drive-2.json', import.meta.url), 'utf8')));
const point = model.points.find((p) => p.quantity === 'acceleration')!;
const gear = model.gearMeshes[0]!.driver.gear;

function analyse(faults: { fault: 'gear-missing-tooth'; component: string; severity: number }[]) {
  const recording = simulateRecording(model, { pointId: point.id, sampleRateHz: 25600, durationS: 8, faults, includeTach: true, seed: 7 });
  return analyseRecording(recording, { model, pointId: point.id, tachChannel: Number(recording.metadata.tachChannel) });
}

describe('gear synchronous averages in analyseRecording', () => {
  it('trends FM0, FM4 and NA4 of every gear when a tach is present, and a tooth fault raises FM4 of its gear', () => {
    const healthy = analyse([]);
    const faulty = analyse([{ fault: 'gear-missing-tooth', component: gear, severity: 1 }]);
    expect(healthy.domain).toBe('angle');
    const gears = model.gearMeshes.flatMap((m) => [m.driver.gear, m.driven.gear]);
    expect(healthy.gearTsa?.map((g) => g.gear)).toEqual(gears);
    const fm4Healthy = healthy.indicators[`tsa:fm4:${gear}`];
    const fm4Faulty = faulty.indicators[`tsa:fm4:${gear}`];
    expect(Number.isFinite(fm4Healthy)).toBe(true);
    expect(Number.isFinite(healthy.indicators[`tsa:na4:${gear}`])).toBe(true);
    expect(fm4Faulty).toBeGreaterThan(1.5 * fm4Healthy!);
  });
});
