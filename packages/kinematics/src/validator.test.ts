import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatProblem, MachineModelError, problemCodes } from './problem.js';
import { assertMachineModel, parseMachineModel } from './loader.js';
import { validateMachineModel } from './validator.js';

const exampleText = readFileSync(new URL('../../../fixtures/machines/aeration-mixer-2.json', import.meta.url), 'utf8');
const example = () => JSON.parse(exampleText) as Record<string, any>;

function problemsOf(input: unknown) {
  const r = validateMachineModel(input);
  if (r.ok) throw new Error('expected problems');
  return r.problems;
}

describe('validateMachineModel', () => {
  it('accepts the example machine of the design page and fills in empty lists', () => {
    const r = validateMachineModel(example());
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.model.gearMeshes).toHaveLength(2);
      expect(validateMachineModel({ id: 'm', speed: { shaft: 's', nominalRpm: 100 }, shafts: [{ id: 's' }] })).toMatchObject({
        ok: true, model: { belts: [], gearMeshes: [], bearings: [], rotors: [], points: [] },
      });
    }
  });

  it('words a bad tooth count the way the contract shows', () => {
    const m = example();
    m.gearMeshes[1].driven.teeth = 0;
    expect(problemsOf(m).map(formatProblem)).toContain('gearMeshes[1].driven.teeth: must be a whole number >= 1');
  });

  it('reports every problem at once, schema and semantic together', () => {
    const m = example();
    m.gearMeshes[1].driven.teeth = 2.5;
    m.belts[0].driver.pitchDiamterMm = 180;
    delete m.belts[0].driver.pitchDiameterMm;
    m.shafts.push({ id: 'spare' });
    m.points[0].near = 'input-nde';
    m.speed.maxRpm = 1400;
    const problems = problemsOf(m);
    expect(problems.map((p) => [p.path, p.code])).toEqual(
      expect.arrayContaining([
        ['gearMeshes[1].driven.teeth', 'not_whole_number'],
        ['belts[0].driver.pitchDiamterMm', 'unknown_field'],
        ['belts[0].driver.pitchDiameterMm', 'required'],
        ['shafts[4]', 'disconnected_shaft'],
        ['points[0].near', 'unknown_bearing'],
        ['speed.maxRpm', 'speed_range'],
      ]),
    );
  });

  it('does not call a shaft unknown when only its own entry is broken', () => {
    const m = example();
    m.shafts[1] = { id: 'input', diameter: 40 };
    const problems = problemsOf(m);
    expect(problems.map((p) => p.code)).toEqual(['unknown_field']);
  });

  it('finds duplicate component ids across shafts, gears and bearings', () => {
    const m = example();
    m.bearings[1].id = 'pinion-1';
    m.shafts[3].id = 'stage-1';
    const problems = problemsOf(m);
    expect(problems.filter((p) => p.code === 'duplicate_id').map((p) => p.path)).toEqual(expect.arrayContaining(['bearings[1].id', 'gearMeshes[0].id']));
  });

  it('finds a gear used twice with different tooth counts', () => {
    const m = example();
    m.gearMeshes[1].driver.gear = 'wheel-1';
    expect(problemsOf(m).map((p) => [p.path, p.code])).toContainEqual(['gearMeshes[1].driver.gear', 'gear_conflict']);
  });

  it('lets one gear mesh with two others when shaft and teeth agree', () => {
    const m = example();
    m.shafts.push({ id: 'second-output' });
    m.gearMeshes.push({ id: 'stage-2b', driver: { gear: 'pinion-2', shaft: 'intermediate', teeth: 23 }, driven: { gear: 'wheel-3', shaft: 'second-output', teeth: 50 } });
    expect(validateMachineModel(m).ok).toBe(true);
  });

  it('finds a loop whose two paths give a shaft different speeds, and accepts a consistent one', () => {
    const m = example();
    m.gearMeshes.push({ id: 'bypass', driver: { gear: 'p9', shaft: 'input', teeth: 10 }, driven: { gear: 'w9', shaft: 'output', teeth: 100 } });
    expect(problemsOf(m).map((p) => p.code)).toContain('inconsistent_ratio');
    // 18/67 × 23/79 = 414/5293: a direct pair with those counts closes the loop consistently.
    m.gearMeshes[2] = { id: 'bypass', driver: { gear: 'p9', shaft: 'input', teeth: 414 }, driven: { gear: 'w9', shaft: 'output', teeth: 5293 } };
    expect(validateMachineModel(m).ok).toBe(true);
  });

  it('checks bearings: geometry or orders, complete geometry, element smaller than pitch circle', () => {
    const m = example();
    m.bearings[0].rollingElementDiameterMm = 39.04;
    m.bearings.push({ id: 'half', shaft: 'output', rollingElements: 9 });
    m.bearings.push({ id: 'both', shaft: 'output', rollingElements: 9, rollingElementDiameterMm: 7, pitchDiameterMm: 40, faultOrders: { bpfo: 3, bpfi: 5, bsf: 2, ftf: 0.4 } });
    const got = problemsOf(m).map((p) => [p.path, p.code]);
    expect(got).toEqual(expect.arrayContaining([
      ['bearings[0].rollingElementDiameterMm', 'bearing_geometry'],
      ['bearings[2].rollingElementDiameterMm', 'bearing_definition'],
      ['bearings[2].pitchDiameterMm', 'bearing_definition'],
      ['bearings[3]', 'bearing_definition'],
    ]));
  });

  it('checks the torsional section: known inertias, links on one shaft, stiffness or geometry', () => {
    const m = example();
    m.torsional.links[0].to = 'wheel-2';
    m.torsional.links.push({ id: 'ghost', from: 'impeller', to: 'nothing', stiffnessNmPerRad: 1 });
    m.torsional.links.push({ id: 'vague', from: 'wheel-2', to: 'impeller' });
    m.torsional.couplings = [{ element: 'v-belt', driverInertia: 'pinion-1' }, { element: 'no-such-belt' }];
    const got = problemsOf(m).map((p) => [p.path, p.code]);
    expect(got).toEqual(expect.arrayContaining([
      ['torsional.links[0]', 'link_across_shafts'],
      ['torsional.links[2].to', 'unknown_inertia'],
      ['torsional.links[3]', 'link_definition'],
      ['torsional.couplings[0].driverInertia', 'coupling_definition'],
      ['torsional.couplings[1].element', 'unknown_element'],
    ]));
  });

  it('checks points: a place that fits the quantity, a unit of that quantity, trip above alarm', () => {
    const m = example();
    m.points.push({ id: 'nowhere', quantity: 'velocity' });
    m.points.push({ id: 'odd-unit', near: 'input-de', quantity: 'velocity', unit: 'g' });
    m.points.push({ id: 'tach-1', quantity: 'tach' });
    m.points.push({ id: 'wrong-at', shaft: 'motor', at: 'impeller', quantity: 'encoder', pulsesPerRev: 60 });
    m.points.push({ id: 'levels', near: 'input-de', quantity: 'velocity', alarmVelocityRmsMmPerS: 4.5, tripVelocityRmsMmPerS: 2.8 });
    m.points.push({ id: 'nowhere', shaft: 'output', quantity: 'displacement', unit: 'um' });
    const got = problemsOf(m).map((p) => [p.path, p.code]);
    expect(got).toEqual([
      ['points[2]', 'point_location'],
      ['points[3].unit', 'invalid_unit'],
      ['points[4]', 'point_location'],
      ['points[5].at', 'point_location'],
      ['points[6].tripVelocityRmsMmPerS', 'alarm_levels'],
      ['points[7].id', 'duplicate_id'],
    ]);
  });

  it('reports a reference shaft that is not a shaft', () => {
    const m = example();
    m.speed.shaft = 'rotor';
    expect(problemsOf(m).map((p) => [p.path, p.code])).toContainEqual(['speed.shaft', 'unknown_shaft']);
  });

  it('never throws and only uses registered codes, whatever JSON it is given', () => {
    fc.assert(
      fc.property(fc.jsonValue(), (value) => {
        const r = validateMachineModel(value);
        if (!r.ok) for (const p of r.problems) expect(problemCodes).toContain(p.code);
      }),
      { numRuns: 300 },
    );
  });

  it('never throws on the example with any one field replaced by random JSON', () => {
    const paths: Array<Array<string | number>> = [];
    const walk = (v: unknown, at: Array<string | number>) => {
      paths.push(at);
      if (Array.isArray(v)) v.forEach((x, i) => walk(x, [...at, i]));
      else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) walk(x, [...at, k]);
    };
    walk(example(), []);
    fc.assert(
      fc.property(fc.constantFrom(...paths.filter((p) => p.length > 0)), fc.jsonValue(), (path, value) => {
        const m = example();
        let target: any = m;
        for (const key of path.slice(0, -1)) target = target[key];
        target[path[path.length - 1]!] = value;
        const r = validateMachineModel(m);
        if (!r.ok) {
          expect(r.problems.length).toBeGreaterThan(0);
          for (const p of r.problems) expect(problemCodes).toContain(p.code);
        }
      }),
      { numRuns: 400 },
    );
  });
});

describe('parseMachineModel', () => {
  it('reads YAML with the same fields as JSON', () => {
    const yaml = [
      'id: tiny', 'speed: { shaft: motor, nominalRpm: 1480 }', 'shafts: [{ id: motor }, { id: fan }]',
      'belts:', '  - id: b', '    driver: { shaft: motor, pitchDiameterMm: 180 }', '    driven: { shaft: fan, pitchDiameterMm: 250 }',
    ].join('\n');
    const fromYaml = parseMachineModel(yaml);
    const fromJson = parseMachineModel(JSON.stringify({
      id: 'tiny', speed: { shaft: 'motor', nominalRpm: 1480 }, shafts: [{ id: 'motor' }, { id: 'fan' }],
      belts: [{ id: 'b', driver: { shaft: 'motor', pitchDiameterMm: 180 }, driven: { shaft: 'fan', pitchDiameterMm: 250 } }],
    }));
    expect(fromYaml).toEqual(fromJson);
    expect(fromYaml.ok).toBe(true);
  });

  it('turns a JSON syntax error into one parse_error problem with line and column', () => {
    const r = parseMachineModel('{\n  "id": "x"\n  "speed": {}\n}');
    expect(r).toMatchObject({ ok: false, problems: [{ path: '', code: 'parse_error' }] });
    if (!r.ok) expect(r.problems[0]!.message).toMatch(/line 3, column 3/);
  });

  it('turns a YAML syntax error into one parse_error problem', () => {
    const r = parseMachineModel('id: x\nspeed: [1, 2\nshafts: 3', 'yaml');
    expect(r).toMatchObject({ ok: false, problems: [{ code: 'parse_error' }] });
    if (!r.ok) expect(r.problems[0]!.message).toMatch(/^not valid YAML/);
  });

  it('refuses YAML tags it does not know instead of guessing', () => {
    const r = parseMachineModel('id: !weird x\nspeed: { shaft: s, nominalRpm: 1 }\nshafts: [{ id: s }]');
    expect(r).toMatchObject({ ok: false, problems: [{ code: 'parse_error' }] });
  });

  it('never throws on random text', () => {
    fc.assert(fc.property(fc.string(), (text) => {
      expect(['boolean']).toContain(typeof parseMachineModel(text).ok);
    }), { numRuns: 300 });
  });
});

describe('assertMachineModel', () => {
  it('throws a MachineModelError that carries every problem', () => {
    const m = example();
    m.gearMeshes[0].driver.teeth = -3;
    m.rotors[0].blades = 0;
    try {
      assertMachineModel(m);
      expect.unreachable();
    } catch (err) {
      expect(err).toBeInstanceOf(MachineModelError);
      const e = err as MachineModelError;
      expect(e.code).toBe('invalid_machine_model');
      expect(e.problems.map((p) => p.path)).toEqual(['gearMeshes[0].driver.teeth', 'rotors[0].blades']);
      expect(e.message).toMatch(/2 problems/);
    }
  });
});
