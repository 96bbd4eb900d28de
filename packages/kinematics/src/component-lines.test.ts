import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { componentLines, formatNumber, type ComponentLine } from './component-lines.js';
import { assertMachineModel } from './loader.js';
import type { MachineModel } from './machine-model.js';

const example = assertMachineModel(JSON.parse(readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8')));
const refHz = 1480 / 60;
// By hand from the example: input 1480 × 180/250 × 0.99 rpm, intermediate × 18/67, output × 23/79.
const inputHz = (1480 * (180 / 250) * 0.99) / 60;
const intermediateHz = (inputHz * 18) / 67;
const outputHz = (intermediateHz * 23) / 79;

function line(lines: ComponentLine[], label: string): ComponentLine {
  const found = lines.find((l) => l.label === label);
  if (!found) throw new Error(`no line '${label}' among ${lines.map((l) => l.label).join(', ')}`);
  return found;
}

describe('componentLines', () => {
  const lines = componentLines(example, refHz);

  it('lists 1× and harmonics of every shaft', () => {
    expect(line(lines, '1× input').frequencyHz).toBeCloseTo(inputHz, 10);
    expect(line(lines, '3× output').frequencyHz).toBeCloseTo(3 * outputHz, 10);
    expect(line(lines, '2× motor')).toMatchObject({ order: 2, component: 'motor', family: 'shaft-harmonic', harmonic: 2, formula: '2 × 24.67 Hz' });
  });

  it('puts the mesh frequency at teeth × shaft speed, equal from either gear', () => {
    // Common practice: GMF = N_p·f_p = N_g·f_g.
    const gmf1 = line(lines, 'GMF stage-1');
    expect(gmf1.frequencyHz).toBeCloseTo(18 * inputHz, 9);
    expect(gmf1.frequencyHz).toBeCloseTo(67 * intermediateHz, 9);
    expect(gmf1.formula).toBe(`18 teeth × ${formatNumber(inputHz)} Hz`);
    expect(line(lines, '3×GMF stage-2').frequencyHz).toBeCloseTo(3 * 23 * intermediateHz, 9);
    expect(line(lines, 'GMF stage-2').frequencyHz).toBeCloseTo(79 * outputHz, 9);
  });

  it('puts sidebands at GMF ± k × the speed of each meshing shaft, naming the gear on that shaft', () => {
    // Common practice: a gear's faults modulate the mesh at its own shaft speed.
    const lower = line(lines, 'GMF stage-1 − 1× intermediate');
    expect(lower.frequencyHz).toBeCloseTo(18 * inputHz - intermediateHz, 9);
    expect(lower).toMatchObject({ family: 'mesh-sideband', sideband: -1, shaft: 'intermediate', gear: 'wheel-1', component: 'stage-1' });
    expect(line(lines, '2×GMF stage-2 + 3× output').frequencyHz).toBeCloseTo(2 * 23 * intermediateHz + 3 * outputHz, 9);
    expect(lines.filter((l) => l.component === 'stage-1' && l.family === 'mesh-sideband')).toHaveLength(3 * 2 * 3 * 2);
  });

  it('gives the hunting-tooth frequency GMF·N_A/(N_p·N_g) and no separate assembly-phase line for hunting sets', () => {
    // Foiles (Vibration Institute); Taylor (2000), from memory: 18/67 and 23/79 are hunting sets (GCD 1).
    expect(line(lines, 'hunting tooth stage-1').frequencyHz).toBeCloseTo((18 * inputHz) / (18 * 67), 12);
    expect(lines.some((l) => l.family === 'assembly-phase')).toBe(false);
  });

  it('gives assembly-phase lines GMF/N_A for a non-hunting pair', () => {
    // Foiles: 20/45 teeth have N_A = 5 assembly phases (check-values §4), each repeating at GMF/5; f_HT = GMF·5/900.
    const pair: MachineModel = {
      id: 'pair', speed: { shaft: 'p', nominalRpm: 1800 }, shafts: [{ id: 'p' }, { id: 'g' }],
      belts: [], bearings: [], rotors: [], points: [],
      gearMeshes: [{ id: 'm', driver: { gear: 'pinion', shaft: 'p', teeth: 20 }, driven: { gear: 'gear', shaft: 'g', teeth: 45 } }],
    };
    const l = componentLines(pair, 30);
    expect(line(l, 'assembly phase m').frequencyHz).toBeCloseTo(120, 12);
    expect(line(l, 'hunting tooth m').frequencyHz).toBeCloseTo(3.3333, 4);
  });

  it('places bearing lines at their orders × the bearing shaft speed, from geometry or from the maker', () => {
    // Randall & Antoni (2011): with the example's 9 × 7.94 mm elements on a 39.04 mm pitch circle, BPFO = 4.5(1 − d/D).
    const dOverD = 7.94 / 39.04;
    expect(line(lines, 'BPFO input-de').frequencyHz).toBeCloseTo(4.5 * (1 - dOverD) * inputHz, 9);
    expect(line(lines, '2×BSF input-de').frequencyHz).toBeCloseTo(2 * (39.04 / (2 * 7.94)) * (1 - dOverD ** 2) * inputHz, 9);
    expect(line(lines, 'BPFI output-nde').frequencyHz).toBeCloseTo(6.62 * outputHz, 9);
    expect(line(lines, 'FTF output-nde')).toMatchObject({ family: 'bearing-ftf', component: 'output-nde', shaft: 'output' });
    expect(line(lines, 'BPFI input-de + 1× input').frequencyHz).toBeCloseTo(4.5 * (1 + dOverD) * inputHz + inputHz, 9);
    expect(line(lines, '2×BSF output-nde − FTF').frequencyHz).toBeCloseTo((2 * 2.81 - 0.398) * outputHz, 9);
  });

  it('gives blade pass, belt pass and the motor lines', () => {
    // Common practice: blade pass = blades × shaft speed; belt pass = π·D·n/L; 2 × line frequency;
    // synchronous speed 120·f/p; slip = synchronous − rotor speed; pole pass = poles × slip.
    expect(line(lines, 'blade pass impeller').frequencyHz).toBeCloseTo(4 * outputHz, 10);
    expect(line(lines, 'belt pass v-belt').frequencyHz).toBeCloseTo((Math.PI * 180 * refHz) / 2240, 10);
    expect(line(lines, '2× line frequency')).toMatchObject({ frequencyHz: 100, scalesWithSpeed: false, component: 'motor' });
    expect(line(lines, 'synchronous speed').frequencyHz).toBeCloseTo(25, 12);
    expect(line(lines, 'slip frequency').frequencyHz).toBeCloseTo(25 - refHz, 12);
    expect(line(lines, 'pole pass frequency').frequencyHz).toBeCloseTo(4 * (25 - refHz), 12);
    expect(line(lines, '1× motor + pole pass').frequencyHz).toBeCloseTo(refHz + 4 * (25 - refHz), 12);
  });

  it('keeps the order of every mechanical line when the speed changes', () => {
    const slower = componentLines(example, 1380 / 60);
    const byLabel = new Map(slower.map((l) => [l.label, l]));
    for (const l of lines.filter((x) => x.scalesWithSpeed)) expect(byLabel.get(l.label)!.order).toBeCloseTo(l.order, 12);
    expect(byLabel.get('2× line frequency')!.frequencyHz).toBe(100);
  });

  it('honours maxHarmonic and sideband options, 0 leaving a family out', () => {
    const few = componentLines(example, refHz, { maxHarmonic: { 'shaft-harmonic': 1, 'gear-mesh': 1, 'bearing-bpfo': 0 }, sidebands: 1, bearingSidebands: 0 });
    expect(few.filter((l) => l.component === 'input' && l.family === 'shaft-harmonic')).toHaveLength(1);
    expect(few.filter((l) => l.family === 'bearing-bpfo')).toHaveLength(0);
    expect(few.filter((l) => l.family === 'bearing-sideband')).toHaveLength(0);
    expect(few.filter((l) => l.component === 'stage-1' && l.family === 'mesh-sideband').map((l) => l.sideband).sort()).toEqual([-1, -1, 1, 1]);
  });

  it('refuses bad speeds and options, naming the parameter', () => {
    expect(() => componentLines(example, -1)).toThrow(/referenceSpeedHz/);
    expect(() => componentLines(example, refHz, { sidebands: 1.5 })).toThrow(/sidebands/);
    expect(() => componentLines(example, refHz, { maxHarmonic: { 'gear-mesh': -1 } })).toThrow(/gear-mesh/);
  });

  it('never lists a line at or below 0 Hz', () => {
    const many = componentLines(example, refHz, { sidebands: 40 });
    expect(many.every((l) => l.frequencyHz > 0)).toBe(true);
  });
});
