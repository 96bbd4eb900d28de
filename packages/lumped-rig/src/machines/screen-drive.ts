import type { RigMachine } from '../rig-machine.js';

/**
 * Brackenrigg quarry (an invented plant), screen 1 drive: a 30 kW four-pole motor on a variable-speed drive, a jaw
 * coupling, a single-stage helical reducer 23:79, and a second coupling to the screen's eccentric shaft.
 * Bearing designations are invented; their geometry is of the size a 30 kW reducer carries.
 */
export const screenDrive: RigMachine = {
  model: {
    id: 'brackenrigg-screen-drive-1',
    name: 'Brackenrigg quarry, screen 1 drive (single-stage helical reducer)',
    notes: 'Invented machine of the lumped-rig corpus. Four-pole motor on a variable-speed drive, jaw coupling, helical reducer 23:79, pin coupling to the screen eccentric shaft.',
    speed: { shaft: 'input', nominalRpm: 1470, minRpm: 900, maxRpm: 1490 },
    shafts: [{ id: 'input', name: 'motor and reducer input' }, { id: 'output', name: 'reducer output' }],
    belts: [],
    gearMeshes: [
      { id: 'reducer-mesh', driver: { gear: 'input-pinion', shaft: 'input', teeth: 23 }, driven: { gear: 'output-wheel', shaft: 'output', teeth: 79 } },
    ],
    bearings: [
      { id: 'input-de', shaft: 'input', designation: 'BQ-B311 (deep groove ball)', rollingElements: 8, rollingElementDiameterMm: 20.5, pitchDiameterMm: 86.0, contactAngleDeg: 0 },
      { id: 'input-nde', shaft: 'input', designation: 'BQ-B308 (deep groove ball)', rollingElements: 9, rollingElementDiameterMm: 15.9, pitchDiameterMm: 71.0, contactAngleDeg: 0 },
      { id: 'output-de', shaft: 'output', designation: 'BQ-T216 (tapered roller)', rollingElements: 20, rollingElementDiameterMm: 13.0, pitchDiameterMm: 132.0, contactAngleDeg: 15 },
      { id: 'output-nde', shaft: 'output', designation: 'BQ-N215 (cylindrical roller)', rollingElements: 17, rollingElementDiameterMm: 15.0, pitchDiameterMm: 128.0, contactAngleDeg: 0 },
    ],
    rotors: [],
    motor: { shaft: 'input', lineFrequencyHz: 50, poles: 4 },
    torsional: {
      dampingRatio: 0.05,
      inertias: [
        { id: 'motor-rotor', shaft: 'input', kgM2: 0.42 },
        { id: 'input-pinion', shaft: 'input', kgM2: 0.0016 },
        { id: 'output-wheel', shaft: 'output', kgM2: 0.14 },
        { id: 'screen-shaft', shaft: 'output', kgM2: 6.5 },
      ],
      links: [
        { id: 'jaw-coupling', from: 'motor-rotor', to: 'input-pinion', stiffnessNmPerRad: 120000 },
        { id: 'pin-coupling', from: 'output-wheel', to: 'screen-shaft', stiffnessNmPerRad: 420000 },
      ],
      couplings: [{ element: 'reducer-mesh', driverInertia: 'input-pinion', drivenInertia: 'output-wheel', stiffnessNmPerRad: 13500000 }],
    },
    points: [
      { id: 'reducer-input-h', name: 'reducer input, drive end, horizontal', near: 'input-de', direction: 'horizontal', quantity: 'acceleration', unit: 'g' },
      { id: 'reducer-input-a', name: 'reducer input, free end, axial', near: 'input-nde', direction: 'axial', quantity: 'acceleration', unit: 'g' },
      { id: 'reducer-output-v', name: 'reducer output, drive end, vertical', near: 'output-de', direction: 'vertical', quantity: 'acceleration', unit: 'g' },
    ],
    iso: { group: 2, foundation: 'rigid' },
  },
  drive: { ratedPowerKw: 30, ratedSlip: 0.018, loadLaw: 'constant-torque', loadFractionRange: [0.5, 0.9], magneticForceN: 15, motorCasing: 'motor' },
  gearStages: [
    { meshId: 'reducer-mesh', pinionId: 'input-pinion', wheelId: 'output-wheel', pinionTeeth: 23, wheelTeeth: 79, moduleMm: 3, pressureAngleDeg: 20, helixAngleDeg: 15, faceWidthMm: 50 },
  ],
  gearBodies: {
    // Gear (solid-disc mass of its pitch cylinder) plus about half its shaft; supports: two ball or roller bearings
    // of this size in series with the housing bore, a few 1e8 N/m (Harris & Kotzalas give ball bearing radial
    // stiffnesses of order 1e8 N/m; from memory).
    'input-pinion': { massKg: 6, supportStiffnessNPerM: 4e8 },
    'output-wheel': { massKg: 28, supportStiffnessNPerM: 8e8 },
  },
  motorInertiaId: 'motor-rotor',
  loadInertiaId: 'screen-shaft',
  couplings: [{ id: 'jaw-coupling', shaft: 'input', radialStiffnessNPerM: 1.5e6 }],
  shafts: {
    input: { casing: 'reducer', rotorMassKg: 14, healthyBalanceGradeRange: [1, 2.5] },
    output: { casing: 'reducer', rotorMassKg: 45, healthyBalanceGradeRange: [1, 2.5] },
  },
  bearings: {
    'input-de': { elementKind: 'ball', weightLoadN: 120, transmissionShare: 0.6, transmissionElement: 'reducer-mesh' },
    'input-nde': { elementKind: 'ball', weightLoadN: 80, transmissionShare: 0.4, transmissionElement: 'reducer-mesh' },
    'output-de': { elementKind: 'roller', weightLoadN: 300, transmissionShare: 0.55, transmissionElement: 'reducer-mesh' },
    'output-nde': { elementKind: 'roller', weightLoadN: 200, transmissionShare: 0.45, transmissionElement: 'reducer-mesh' },
  },
  pointHousingMassKg: { 'reducer-input-h': 70, 'reducer-input-a': 90, 'reducer-output-v': 110 },
};
