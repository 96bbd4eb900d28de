import { readdirSync, readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { componentLines } from './component-lines.js';
import { parseMachineModel } from './loader.js';
import { shaftSpeeds } from './shaft-speeds.js';

const dir = new URL('../../../fixtures/machines/', import.meta.url);
const read = (name: string) => readFileSync(new URL(name, dir), 'utf8');
const machineFiles = readdirSync(dir).filter((f) => /\.(json|ya?ml)$/.test(f));

describe('fixtures/machines', () => {
  // The contract document of the project (docs/machine-model.md) shows this file word for word.
  const contract = new URL('../../../docs/machine-model.md', import.meta.url);
  it('holds the example of the contract document, docs/machine-model.md', () => {
    const block = /```json\n([\s\S]*?)```/.exec(readFileSync(contract, 'utf8'))?.[1];
    expect(block).toBeDefined();
    expect(JSON.parse(read('aeration-mixer-2.json'))).toEqual(JSON.parse(block!));
  });

  for (const file of machineFiles) {
    it(`${file} is valid and yields speeds and lines`, () => {
      const r = parseMachineModel(read(file));
      if (!r.ok) throw new Error(r.problems.map((p) => `${p.path}: ${p.message}`).join('\n'));
      const speeds = shaftSpeeds(r.model);
      expect(speeds.every((s) => s.speedRpm > 0)).toBe(true);
      expect(componentLines(r.model, r.model.speed.nominalRpm / 60).length).toBeGreaterThan(r.model.shafts.length);
      for (const p of r.model.points.filter((q) => q.quantity !== 'tach' && q.quantity !== 'encoder')) {
        expect(p.unit, `${file} ${p.id} unit`).toBeDefined();
        expect(p.resonances ?? r.model.iso, `${file} ${p.id}`).toBeDefined();
      }
    });
  }

  it('has a YAML copy that reads the same as its JSON', () => {
    const json = parseMachineModel(read('skelmere-feed-pump-3.json'));
    const yaml = parseMachineModel(read('skelmere-feed-pump-3.yaml'));
    expect(yaml).toEqual(json);
  });
});

describe('fixtures/machines/invalid', () => {
  const expected: Record<string, Array<[string, string]>> = {
    'bad-teeth.json': [
      ['belts[0].driver.pitchDiameterMm', 'out_of_range'],
      ['belts[0].beltLenghtMm', 'unknown_field'],
      ['gearMeshes[0].driver.teeth', 'out_of_range'],
      ['gearMeshes[0].driven.teeth', 'not_whole_number'],
    ],
    'disconnected-shaft.json': [['shafts[2]', 'disconnected_shaft']],
    'inconsistent-loop.json': [['gearMeshes[1]', 'inconsistent_ratio']],
    'unknown-references.json': [
      ['shafts[2].id', 'duplicate_id'],
      ['gearMeshes[0].driven.shaft', 'unknown_shaft'],
      ['bearings[0].shaft', 'unknown_shaft'],
      ['motor.shaft', 'unknown_shaft'],
      ['points[0].near', 'unknown_bearing'],
    ],
    'bearing-geometry.json': [
      ['bearings[0].rollingElementDiameterMm', 'bearing_geometry'],
      ['bearings[1]', 'bearing_definition'],
      ['bearings[2]', 'bearing_definition'],
    ],
    'speed-range.json': [['speed.minRpm', 'speed_range'], ['speed.maxRpm', 'speed_range']],
    'link-across-shafts.yaml': [
      ['torsional.links[0]', 'link_across_shafts'],
      ['torsional.links[1]', 'link_definition'],
      ['torsional.links[1].lengthMm', 'link_definition'],
      ['torsional.links[1].shearModulusGPa', 'link_definition'],
    ],
    'syntax-error.json': [['', 'parse_error']],
  };

  it('has an expectation for every broken file', () => {
    expect(readdirSync(new URL('invalid/', dir)).filter((f) => /\.(json|ya?ml)$/.test(f)).sort()).toEqual(Object.keys(expected).sort());
  });

  for (const [file, problems] of Object.entries(expected)) {
    it(`${file} gives exactly its problems`, () => {
      const r = parseMachineModel(read(`invalid/${file}`));
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.problems.map((p) => [p.path, p.code])).toEqual(problems);
    });
  }
});
