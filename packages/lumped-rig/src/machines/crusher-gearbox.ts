import type { RigMachine } from '../rig-machine.js';

/**
 * Brackenrigg quarry (an invented plant), secondary crusher 2 drive: a 90 kW six-pole motor, a two-stage parallel
 * gearbox (helical 19:71, then spur 17:59) and a heavy flywheel on the crusher shaft. Bearing designations are
 * invented; their geometry is of the size such a gearbox carries.
 */
export const crusherGearbox: RigMachine = {
  model: {
    id: 'brackenrigg-crusher-gearbox-2',
    name: 'Brackenrigg quarry, secondary crusher 2 gearbox (two-stage)',
    notes: 'Invented machine of the lumped-rig corpus. Six-pole motor on a variable-speed drive, flexible coupling, helical first stage 19:71, spur second stage 17:59, crusher flywheel on the output.',
    speed: { shaft: 'input', nominalRpm: 985, minRpm: 600, maxRpm: 990 },
    shafts: [{ id: 'input', name: 'motor and gearbox input' }, { id: 'intermediate' }, { id: 'output', name: 'gearbox output and crusher flywheel' }],
    belts: [],
    gearMeshes: [
      { id: 'hs-mesh', driver: { gear: 'hs-pinion', shaft: 'input', teeth: 19 }, driven: { gear: 'hs-wheel', shaft: 'intermediate', teeth: 71 } },
      { id: 'ls-mesh', driver: { gear: 'ls-pinion', shaft: 'intermediate', teeth: 17 }, driven: { gear: 'ls-wheel', shaft: 'output', teeth: 59 } },
    ],
    bearings: [
      { id: 'input-de', shaft: 'input', designation: 'BQ-N313 (cylindrical roller)', rollingElements: 14, rollingElementDiameterMm: 16.0, pitchDiameterMm: 100.0, contactAngleDeg: 0 },
      { id: 'input-nde', shaft: 'input', designation: 'BQ-B312 (deep groove ball)', rollingElements: 9, rollingElementDiameterMm: 19.0, pitchDiameterMm: 95.0, contactAngleDeg: 0 },
      { id: 'intermediate-de', shaft: 'intermediate', designation: 'BQ-T318 (tapered roller)', rollingElements: 17, rollingElementDiameterMm: 16.0, pitchDiameterMm: 138.0, contactAngleDeg: 14 },
      { id: 'intermediate-nde', shaft: 'intermediate', designation: 'BQ-N320 (cylindrical roller)', rollingElements: 15, rollingElementDiameterMm: 18.0, pitchDiameterMm: 150.0, contactAngleDeg: 0 },
      { id: 'output-de', shaft: 'output', designation: 'BQ-S2228 (spherical roller)', rollingElements: 19, rollingElementDiameterMm: 24.0, pitchDiameterMm: 215.0, contactAngleDeg: 10 },
      { id: 'output-nde', shaft: 'output', designation: 'BQ-S2226 (spherical roller)', rollingElements: 18, rollingElementDiameterMm: 22.0, pitchDiameterMm: 198.0, contactAngleDeg: 10 },
    ],
    rotors: [],
    motor: { shaft: 'input', lineFrequencyHz: 50, poles: 6 },
    torsional: {
      dampingRatio: 0.05,
      inertias: [
        { id: 'motor-rotor', shaft: 'input', kgM2: 1.9 },
        { id: 'hs-pinion', shaft: 'input', kgM2: 0.0024 },
        { id: 'hs-wheel', shaft: 'intermediate', kgM2: 0.33 },
        { id: 'ls-pinion', shaft: 'intermediate', kgM2: 0.0095 },
        { id: 'ls-wheel', shaft: 'output', kgM2: 1.09 },
        { id: 'crusher-flywheel', shaft: 'output', kgM2: 180 },
      ],
      links: [
        { id: 'motor-coupling', from: 'motor-rotor', to: 'hs-pinion', stiffnessNmPerRad: 300000 },
        { id: 'intermediate-shaft', from: 'hs-wheel', to: 'ls-pinion', diameterMm: 90, lengthMm: 260, shearModulusGPa: 79.3 },
        { id: 'crusher-coupling', from: 'ls-wheel', to: 'crusher-flywheel', stiffnessNmPerRad: 4500000 },
      ],
      couplings: [
        { element: 'hs-mesh', driverInertia: 'hs-pinion', drivenInertia: 'hs-wheel', stiffnessNmPerRad: 22800000 },
        { element: 'ls-mesh', driverInertia: 'ls-pinion', drivenInertia: 'ls-wheel', stiffnessNmPerRad: 51800000 },
      ],
    },
    points: [
      { id: 'gearbox-input-h', name: 'gearbox input, drive end, horizontal', near: 'input-de', direction: 'horizontal', quantity: 'acceleration', unit: 'g' },
      { id: 'gearbox-input-a', name: 'gearbox input, free end, axial', near: 'input-nde', direction: 'axial', quantity: 'acceleration', unit: 'g' },
      { id: 'gearbox-intermediate-v', name: 'gearbox intermediate, drive end, vertical', near: 'intermediate-de', direction: 'vertical', quantity: 'acceleration', unit: 'g' },
      { id: 'gearbox-output-h', name: 'gearbox output, drive end, horizontal', near: 'output-de', direction: 'horizontal', quantity: 'acceleration', unit: 'g' },
    ],
    iso: { group: 2, foundation: 'rigid' },
  },
  drive: { ratedPowerKw: 90, ratedSlip: 0.015, loadLaw: 'constant-torque', loadFractionRange: [0.4, 0.85], magneticForceN: 40, motorCasing: 'motor' },
  gearStages: [
    { meshId: 'hs-mesh', pinionId: 'hs-pinion', wheelId: 'hs-wheel', pinionTeeth: 19, wheelTeeth: 71, moduleMm: 4, pressureAngleDeg: 20, helixAngleDeg: 12, faceWidthMm: 60 },
    { meshId: 'ls-mesh', pinionId: 'ls-pinion', wheelId: 'ls-wheel', pinionTeeth: 17, wheelTeeth: 59, moduleMm: 6, pressureAngleDeg: 20, helixAngleDeg: 0, faceWidthMm: 90 },
  ],
  gearBodies: {
    'hs-pinion': { massKg: 9, supportStiffnessNPerM: 5e8 },
    'hs-wheel': { massKg: 45, supportStiffnessNPerM: 9e8 },
    'ls-pinion': { massKg: 20, supportStiffnessNPerM: 9e8 },
    'ls-wheel': { massKg: 95, supportStiffnessNPerM: 1.4e9 },
  },
  motorInertiaId: 'motor-rotor',
  loadInertiaId: 'crusher-flywheel',
  couplings: [{ id: 'motor-coupling', shaft: 'input', radialStiffnessNPerM: 3e6 }],
  shafts: {
    input: { casing: 'gearbox', rotorMassKg: 25, healthyBalanceGradeRange: [1, 2.5] },
    intermediate: { casing: 'gearbox', rotorMassKg: 70, healthyBalanceGradeRange: [1, 2.5] },
    output: { casing: 'gearbox', rotorMassKg: 160, healthyBalanceGradeRange: [1, 2.5] },
  },
  bearings: {
    'input-de': { elementKind: 'roller', weightLoadN: 200, transmissionShare: 0.6, transmissionElement: 'hs-mesh' },
    'input-nde': { elementKind: 'ball', weightLoadN: 150, transmissionShare: 0.4, transmissionElement: 'hs-mesh' },
    'intermediate-de': { elementKind: 'roller', weightLoadN: 400, transmissionShare: 0.5, transmissionElement: 'ls-mesh' },
    'intermediate-nde': { elementKind: 'roller', weightLoadN: 300, transmissionShare: 0.4, transmissionElement: 'ls-mesh' },
    'output-de': { elementKind: 'roller', weightLoadN: 900, transmissionShare: 0.55, transmissionElement: 'ls-mesh' },
    'output-nde': { elementKind: 'roller', weightLoadN: 700, transmissionShare: 0.45, transmissionElement: 'ls-mesh' },
  },
  pointHousingMassKg: { 'gearbox-input-h': 180, 'gearbox-input-a': 220, 'gearbox-intermediate-v': 260, 'gearbox-output-h': 320 },
};
