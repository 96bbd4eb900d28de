import { bearingFaultOrdersFromGeometry, faultComponentKinds, faultKinds, shaftRatios, validateMachineModel, type MachineModel } from '@kinespec/kinematics';
import { describe, expect, it } from 'vitest';
import { defectFrequenciesHz } from './bearing-kinematics.js';
import { faultOptions } from './corpus.js';
import { gearStageGeometry, solidDisc } from './gear-geometry.js';
import { shaftSpeedsHz } from './rig-machine.js';
import { rigMachines } from './rig-machines.js';
import { rigFaultKinds } from './rig-faults.js';

describe('the rig machines', () => {
  it('are three or more machines of an invented plant, none of the demo fixtures', () => {
    expect(rigMachines.length).toBeGreaterThanOrEqual(3);
    for (const m of rigMachines) expect(m.model.id.startsWith('brackenrigg-')).toBe(true);
  });

  for (const machine of rigMachines) {
    describe(machine.model.id, () => {
      it('passes validateMachineModel of @kinespec/kinematics, and validation changes nothing', () => {
        const result = validateMachineModel(machine.model);
        if (!result.ok) throw new Error(JSON.stringify(result.problems));
        expect(result.model).toEqual(machine.model);
        // The document is typed as the model the analysis takes.
        const asModel: MachineModel = machine.model;
        expect(asModel.points.length).toBeGreaterThan(0);
      });

      it('has points near bearings, an ISO class and a speed range', () => {
        expect(machine.model.iso).toBeDefined();
        expect(machine.model.speed.minRpm).toBeLessThan(machine.model.speed.maxRpm!);
        for (const p of machine.model.points) expect(machine.model.bearings.some((b) => b.id === p.near)).toBe(true);
      });

      it('gives the rig data every shaft, bearing, point and gear needs', () => {
        for (const s of machine.model.shafts) expect(machine.shafts[s.id]).toBeDefined();
        for (const b of machine.model.bearings) expect(machine.bearings[b.id]).toBeDefined();
        for (const p of machine.model.points) expect(machine.pointHousingMassKg[p.id]).toBeGreaterThan(0);
        for (const st of machine.gearStages) {
          const mesh = machine.model.gearMeshes.find((m) => m.id === st.meshId)!;
          expect([mesh.driver.gear, mesh.driver.teeth, mesh.driven.gear, mesh.driven.teeth]).toEqual([st.pinionId, st.pinionTeeth, st.wheelId, st.wheelTeeth]);
          expect(machine.gearBodies[st.pinionId]).toBeDefined();
          expect(machine.gearBodies[st.wheelId]).toBeDefined();
        }
      });

      it('states in its torsional section the mesh stiffness the rig simulates: k̄·r_bg² referred to the wheel (±1 %)', () => {
        for (const st of machine.gearStages) {
          const g = gearStageGeometry(st);
          const coupling = machine.model.torsional!.couplings!.find((c) => c.element === st.meshId)!;
          expect(Math.abs(coupling.stiffnessNmPerRad! / (g.meanMeshStiffnessNPerM * g.baseRadiusWheelM ** 2) - 1)).toBeLessThan(0.01);
        }
      });

      it('states gear inertias of solid steel bodies of the pitch cylinder, pinions with some shaft (0.9-1.8 × the disc)', () => {
        for (const st of machine.gearStages) {
          const g = gearStageGeometry(st);
          for (const [id, r] of [[st.pinionId, g.pitchRadiusPinionM], [st.wheelId, g.pitchRadiusWheelM]] as const) {
            const stated = machine.model.torsional!.inertias.find((i) => i.id === id)!.kgM2;
            const disc = solidDisc(r, st.faceWidthMm / 1000).inertiaKgM2;
            expect(stated / disc).toBeGreaterThan(0.9);
            expect(stated / disc).toBeLessThan(1.8);
          }
        }
      });

      it('runs its shafts at the speeds @kinespec/kinematics derives (at the model belt slip)', () => {
        const slip = machine.model.belts[0]?.slipPercent ?? 0;
        const mine = shaftSpeedsHz(machine, 1200, slip);
        for (const r of shaftRatios(machine.model as MachineModel)) expect(mine[r.shaft]! / (1200 / 60)).toBeCloseTo(r.ratio, 12);
      });

      it('computes the bearing defect frequencies @kinespec/kinematics computes', () => {
        for (const b of machine.model.bearings) {
          const mine = defectFrequenciesHz(b, 1);
          const theirs = bearingFaultOrdersFromGeometry(b);
          expect([mine.bpfoHz, mine.bpfiHz, mine.bsfHz, mine.ftfHz].map((x) => x.toFixed(10))).toEqual([theirs.bpfo, theirs.bpfi, theirs.bsf, theirs.ftf].map((x) => x.toFixed(10)));
        }
      });
    });
  }

  it('names its faults with Kinespec fault kinds, each on a component of the right kind', () => {
    for (const kind of rigFaultKinds) expect(faultKinds).toContain(kind);
    for (const o of faultOptions()) {
      const m = o.machine.model;
      const allowed = faultComponentKinds[o.fault];
      const kindOf =
        m.gearMeshes.some((g) => g.id === o.component) ? 'gear-mesh'
        : m.gearMeshes.some((g) => g.driver.gear === o.component || g.driven.gear === o.component) ? 'gear'
        : m.bearings.some((b) => b.id === o.component) ? 'bearing'
        : m.rotors.some((r) => r.id === o.component) ? 'rotor'
        : m.shafts.some((s) => s.id === o.component) ? 'shaft'
        : 'unknown';
      expect(allowed).toContain(kindOf);
      expect(o.points.length).toBeGreaterThan(0);
    }
  });
});
