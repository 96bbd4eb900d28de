import type { RigMachine } from '../rig-machine.js';

/**
 * Brackenrigg quarry (an invented plant), dust extraction fan 3: a 37 kW two-pole motor on a variable-speed drive,
 * V-belts 200/265 mm, an overhung centrifugal impeller of 11 blades on two plummer-block bearings, on a spring-mounted
 * base (flexible foundation). Bearing designations are invented; geometry of the size such a fan carries.
 */
export const dustFan: RigMachine = {
  model: {
    id: 'brackenrigg-dust-fan-3',
    name: 'Brackenrigg quarry, dust extraction fan 3 (belt-driven)',
    notes: 'Invented machine of the lumped-rig corpus. Two-pole motor on a variable-speed drive, V-belt drive 200/265 mm, overhung centrifugal impeller on two plummer blocks, spring-mounted base.',
    speed: { shaft: 'motor', nominalRpm: 2955, minRpm: 1500, maxRpm: 2980 },
    shafts: [{ id: 'motor' }, { id: 'fan', name: 'fan shaft and impeller' }],
    belts: [
      { id: 'fan-belts', driver: { shaft: 'motor', pitchDiameterMm: 200 }, driven: { shaft: 'fan', pitchDiameterMm: 265 }, beltLengthMm: 2360, slipPercent: 1.5 },
    ],
    gearMeshes: [],
    bearings: [
      { id: 'motor-de', shaft: 'motor', designation: 'BQ-B313 (deep groove ball)', rollingElements: 8, rollingElementDiameterMm: 22.2, pitchDiameterMm: 100.0, contactAngleDeg: 0 },
      { id: 'motor-nde', shaft: 'motor', designation: 'BQ-B310 (deep groove ball)', rollingElements: 8, rollingElementDiameterMm: 17.5, pitchDiameterMm: 80.0, contactAngleDeg: 0 },
      { id: 'fan-de', shaft: 'fan', designation: 'BQ-S2212 (spherical roller, plummer block)', rollingElements: 16, rollingElementDiameterMm: 14.0, pitchDiameterMm: 101.5, contactAngleDeg: 9 },
      { id: 'fan-nde', shaft: 'fan', designation: 'BQ-S2210 (spherical roller, plummer block)', rollingElements: 15, rollingElementDiameterMm: 12.5, pitchDiameterMm: 92.0, contactAngleDeg: 9 },
    ],
    rotors: [{ id: 'fan-impeller', shaft: 'fan', blades: 11, kind: 'fan' }],
    motor: { shaft: 'motor', lineFrequencyHz: 50, poles: 2 },
    points: [
      { id: 'fan-de-h', name: 'fan bearing, drive end, horizontal', near: 'fan-de', direction: 'horizontal', quantity: 'acceleration', unit: 'g' },
      { id: 'fan-nde-v', name: 'fan bearing, impeller end, vertical', near: 'fan-nde', direction: 'vertical', quantity: 'acceleration', unit: 'g' },
      { id: 'motor-de-h', name: 'motor, drive end, horizontal', near: 'motor-de', direction: 'horizontal', quantity: 'acceleration', unit: 'g' },
    ],
    iso: { group: 2, foundation: 'flexible' },
  },
  drive: { ratedPowerKw: 37, ratedSlip: 0.012, loadLaw: 'fan', loadFractionRange: [0.7, 0.95], magneticForceN: 20, motorCasing: 'motor' },
  gearStages: [],
  gearBodies: {},
  couplings: [],
  shafts: {
    motor: { casing: 'motor', rotorMassKg: 45, healthyBalanceGradeRange: [1, 2.5] },
    fan: { casing: 'fan-pedestals', rotorMassKg: 65, healthyBalanceGradeRange: [1, 2.5] },
  },
  bearings: {
    // A V-belt drive loads its shafts with about twice the effective pull (common practice: shaft load 1.5-2.5 × pull).
    'motor-de': { elementKind: 'ball', weightLoadN: 150, transmissionShare: 0.8, transmissionElement: 'fan-belts' },
    'motor-nde': { elementKind: 'ball', weightLoadN: 150, transmissionShare: 0.2, transmissionElement: 'fan-belts' },
    'fan-de': { elementKind: 'roller', weightLoadN: 250, transmissionShare: 0.9, transmissionElement: 'fan-belts' },
    'fan-nde': { elementKind: 'roller', weightLoadN: 550, transmissionShare: 0.1, transmissionElement: 'fan-belts' },
  },
  // The fan, its frame and motor ride on springs as one body of some 600 kg; each bearing sees a share of it.
  pointHousingMassKg: { 'fan-de-h': 200, 'fan-nde-v': 220, 'motor-de-h': 260 },
  beltSlipPercentRange: [0.8, 2.0],
  bladePass: { rotorId: 'fan-impeller', forceAtMaxSpeedN: 40 },
};
