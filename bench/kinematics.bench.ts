// Throughput of the machine-model validator and the component line catalogue (figures only; nothing is asserted).
import { readFileSync } from 'node:fs';
import { componentLines, flagLines, loadMachineModel, parseMachineModel } from '../packages/kinematics/src/index.ts';

const text = readFileSync(new URL('../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8');
const model = loadMachineModel(text);

function rate(name: string, run: () => void, minMs = 1500): void {
  for (let i = 0; i < 50; i++) run();
  let n = 0;
  const t0 = performance.now();
  while (performance.now() - t0 < minMs) {
    run();
    n++;
  }
  const ms = (performance.now() - t0) / n;
  console.log(`${name.padEnd(52)} ${(1000 / ms).toFixed(0).padStart(8)} /s  (${(ms * 1000).toFixed(1)} µs each)`);
}

rate('parseMachineModel (example, JSON text)', () => { parseMachineModel(text); });
rate('componentLines (example, defaults)', () => { componentLines(model, 24.6667); });
const many = componentLines(model, 24.6667, { sidebands: 10, maxHarmonic: { 'shaft-harmonic': 40, 'gear-mesh': 6 } });
rate(`componentLines (example, ${many.length} lines)`, () => { componentLines(model, 24.6667, { sidebands: 10, maxHarmonic: { 'shaft-harmonic': 40, 'gear-mesh': 6 } }); });
rate(`flagLines (${many.length} lines, 0.25 Hz resolution)`, () => { flagLines(many, { sampleRateHz: 25600, frequencyResolutionHz: 0.25 }); });
