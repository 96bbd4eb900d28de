import { bearingFaultOrders } from './bearing-frequencies.js';
import { beltPassFrequencyHz } from './belt-frequencies.js';
import { assemblyPhaseCount } from './gear-frequencies.js';
import { motorComponentId, type MachineModel } from './machine-model.js';
import { polePassFrequencyHz, slipFrequencyHz, synchronousSpeedHz } from './motor-frequencies.js';
import { shaftRatios } from './shaft-speeds.js';

export const lineFamilies = [
  'shaft-harmonic',
  'gear-mesh',
  'mesh-sideband',
  'hunting-tooth',
  'assembly-phase',
  'bearing-bpfo',
  'bearing-bpfi',
  'bearing-bsf',
  'bearing-ftf',
  'bearing-sideband',
  'blade-pass',
  'belt-pass',
  'line-frequency',
  'synchronous-speed',
  'slip',
  'pole-pass',
] as const;

export type LineFamily = (typeof lineFamilies)[number];

export type ComponentKind = 'shaft' | 'gear-mesh' | 'bearing' | 'rotor' | 'belt' | 'motor';

/** One line a component puts (or may put) into the spectrum at a given speed. */
export interface ComponentLine {
  frequencyHz: number;
  /** frequencyHz over the reference shaft's speed. */
  order: number;
  /** e.g. "2× input", "GMF stage-1", "GMF stage-1 − 1× intermediate", "BPFO input-de". */
  label: string;
  /** Id of the component the line belongs to (shaft, gear mesh, bearing, rotor, belt or motor). */
  component: string;
  componentKind: ComponentKind;
  family: LineFamily;
  /** Harmonic number of the family's fundamental (for sidebands: of the carrier). */
  harmonic: number;
  /** Signed sideband index k of carrier ± k × modulation; absent on carriers. */
  sideband?: number;
  /** The shaft whose speed sets the line (for sidebands: the modulating shaft). */
  shaft?: string;
  /** For mesh sidebands: the gear of the mesh on the modulating shaft. */
  gear?: string;
  /** How the number was made, e.g. "18 teeth × 14.46 Hz". */
  formula: string;
  /** True when the line is a fixed order of the reference shaft (moves in proportion to speed). */
  scalesWithSpeed: boolean;
}

export interface ComponentLineOptions {
  /** Highest harmonic per family (defaults in `defaultHarmonics`). 0 leaves the family out. */
  maxHarmonic?: Partial<Record<LineFamily, number>>;
  /** Sidebands k = 1..sidebands on each side of every mesh-frequency harmonic (default 3). */
  sidebands?: number;
  /** Sidebands on each side of BPFI (at shaft speed) and 2×BSF (at FTF) harmonics (default 1). */
  bearingSidebands?: number;
}

/** Default highest harmonic per family. */
export const defaultHarmonics: Readonly<Record<LineFamily, number>> = {
  'shaft-harmonic': 5,
  'gear-mesh': 3,
  'mesh-sideband': 3,
  'hunting-tooth': 1,
  'assembly-phase': 1,
  'bearing-bpfo': 3,
  'bearing-bpfi': 3,
  'bearing-bsf': 2,
  'bearing-ftf': 1,
  'bearing-sideband': 3,
  'blade-pass': 3,
  'belt-pass': 2,
  'line-frequency': 1,
  'synchronous-speed': 1,
  'slip': 1,
  'pole-pass': 1,
};

/** Four significant figures, no trailing zeros: 14.46, 260.3, 0.3983. */
export function formatNumber(x: number): string {
  if (x === 0 || !Number.isFinite(x)) return String(x);
  return Number(x.toPrecision(4)).toString();
}

function times(h: number, what: string): string {
  return h === 1 ? what : `${h}×${what}`;
}

/**
 * The component frequency catalogue of a machine with its reference shaft at `referenceSpeedHz`:
 * shaft harmonics, gear mesh frequencies with their sidebands, hunting-tooth and assembly-phase
 * frequencies, bearing defect frequencies, blade pass, belt pass and the motor's electrical lines.
 * Lines come grouped by component, in the order of the model file. Lines at or below 0 Hz are left out.
 */
export function componentLines(model: MachineModel, referenceSpeedHz: number, options: ComponentLineOptions = {}): ComponentLine[] {
  if (!(referenceSpeedHz > 0) || !Number.isFinite(referenceSpeedHz)) {
    throw new RangeError(`referenceSpeedHz (${referenceSpeedHz}) must be a finite number > 0`);
  }
  const max = { ...defaultHarmonics, ...options.maxHarmonic };
  for (const [family, n] of Object.entries(max)) {
    if (!Number.isInteger(n) || n < 0) throw new RangeError(`maxHarmonic['${family}'] (${n}) must be a whole number >= 0`);
  }
  const sidebands = options.sidebands ?? 3;
  const bearingSidebands = options.bearingSidebands ?? 1;
  if (!Number.isInteger(sidebands) || sidebands < 0) throw new RangeError(`sidebands (${sidebands}) must be a whole number >= 0`);
  if (!Number.isInteger(bearingSidebands) || bearingSidebands < 0) {
    throw new RangeError(`bearingSidebands (${bearingSidebands}) must be a whole number >= 0`);
  }

  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  const hz = (shaft: string) => ratio.get(shaft)! * referenceSpeedHz;
  const lines: ComponentLine[] = [];
  /** A line that is a fixed order of the reference shaft. */
  const orderLine = (order: number, rest: Omit<ComponentLine, 'frequencyHz' | 'order' | 'scalesWithSpeed'>) => {
    if (order > 0) lines.push({ frequencyHz: order * referenceSpeedHz, order, ...rest, scalesWithSpeed: true });
  };
  /** A line at a frequency that does not follow the speed in proportion (electrical lines, slip). */
  const fixedLine = (frequencyHz: number, rest: Omit<ComponentLine, 'frequencyHz' | 'order' | 'scalesWithSpeed'>) => {
    if (frequencyHz > 0) lines.push({ frequencyHz, order: frequencyHz / referenceSpeedHz, ...rest, scalesWithSpeed: false });
  };

  // Shafts: 1× and its harmonics (common practice: unbalance, misalignment, looseness families).
  for (const shaft of model.shafts) {
    const r = ratio.get(shaft.id)!;
    for (let h = 1; h <= max['shaft-harmonic']; h++) {
      orderLine(h * r, {
        label: `${h}× ${shaft.id}`, component: shaft.id, componentKind: 'shaft', family: 'shaft-harmonic', harmonic: h,
        shaft: shaft.id, formula: `${h} × ${formatNumber(hz(shaft.id))} Hz`,
      });
    }
  }

  for (const mesh of model.gearMeshes) {
    const { driver, driven } = mesh;
    // Common practice: GMF = N·f of either gear of the pair.
    const gmfOrder = driver.teeth * ratio.get(driver.shaft)!;
    const gmfHz = gmfOrder * referenceSpeedHz;
    const base = { component: mesh.id, componentKind: 'gear-mesh' as const };
    const gmfLabel = (h: number) => times(h, `GMF ${mesh.id}`);
    for (let h = 1; h <= max['gear-mesh']; h++) {
      orderLine(h * gmfOrder, {
        ...base, label: gmfLabel(h), family: 'gear-mesh', harmonic: h,
        formula: `${h === 1 ? '' : `${h} × `}${driver.teeth} teeth × ${formatNumber(hz(driver.shaft))} Hz`,
      });
    }
    // Common practice (Randall, Vibration-based Condition Monitoring, 2011, Ch. 2, from memory): modulation by either gear's shaft puts sidebands at GMF harmonics ± k·f_shaft.
    for (let h = 1; h <= Math.min(max['gear-mesh'], max['mesh-sideband']); h++) {
      for (const side of [driver, driven]) {
        const sr = ratio.get(side.shaft)!;
        for (let k = 1; k <= sidebands; k++) {
          for (const sign of [-1, 1]) {
            orderLine(h * gmfOrder + sign * k * sr, {
              ...base, label: `${gmfLabel(h)} ${sign < 0 ? '−' : '+'} ${k}× ${side.shaft}`, family: 'mesh-sideband',
              harmonic: h, sideband: sign * k, shaft: side.shaft, gear: side.gear,
              formula: `${formatNumber(h * gmfHz)} Hz ${sign < 0 ? '−' : '+'} ${k} × ${formatNumber(hz(side.shaft))} Hz`,
            });
          }
        }
      }
    }
    const phases = assemblyPhaseCount(driver.teeth, driven.teeth);
    // Taylor (2000), Foiles (Vibration Institute): f_HT = GMF·N_A/(N_p·N_g).
    const htOrder = (gmfOrder * phases) / (driver.teeth * driven.teeth);
    for (let h = 1; h <= max['hunting-tooth']; h++) {
      orderLine(h * htOrder, {
        ...base, label: times(h, `hunting tooth ${mesh.id}`), family: 'hunting-tooth', harmonic: h,
        formula: `${h === 1 ? '' : `${h} × `}${formatNumber(gmfHz)} Hz × ${phases} / (${driver.teeth} × ${driven.teeth})`,
      });
    }
    // Foiles (Vibration Institute): f_AP = GMF/N_A; with N_A = 1 it is the mesh frequency itself, so no line of its own.
    if (phases > 1) {
      for (let h = 1; h <= max['assembly-phase']; h++) {
        orderLine((h * gmfOrder) / phases, {
          ...base, label: times(h, `assembly phase ${mesh.id}`), family: 'assembly-phase', harmonic: h,
          formula: `${h === 1 ? '' : `${h} × `}${formatNumber(gmfHz)} Hz / ${phases} assembly phases`,
        });
      }
    }
  }

  for (const bearing of model.bearings) {
    const orders = bearingFaultOrders(bearing);
    const r = ratio.get(bearing.shaft)!;
    const fr = formatNumber(hz(bearing.shaft));
    const base = { component: bearing.id, componentKind: 'bearing' as const, shaft: bearing.shaft };
    const source = bearing.faultOrders ? 'maker' : 'geometry';
    const families = [
      ['BPFO', 'bearing-bpfo', orders.bpfo],
      ['BPFI', 'bearing-bpfi', orders.bpfi],
      ['BSF', 'bearing-bsf', orders.bsf],
      ['FTF', 'bearing-ftf', orders.ftf],
    ] as const;
    for (const [name, family, o] of families) {
      for (let h = 1; h <= max[family]; h++) {
        orderLine(h * o * r, {
          ...base, label: `${times(h, name)} ${bearing.id}`, family, harmonic: h,
          formula: `${h === 1 ? '' : `${h} × `}${formatNumber(o)} (${name} order, ${source}) × ${fr} Hz`,
        });
      }
    }
    // Common practice (Randall & Antoni 2011): an inner-race defect is modulated at shaft speed, a rolling element at the cage speed.
    for (let h = 1; h <= Math.min(max['bearing-bpfi'], max['bearing-sideband']); h++) {
      for (let k = 1; k <= bearingSidebands; k++) {
        for (const sign of [-1, 1]) {
          orderLine(h * orders.bpfi * r + sign * k * r, {
            ...base, label: `${times(h, 'BPFI')} ${bearing.id} ${sign < 0 ? '−' : '+'} ${k}× ${bearing.shaft}`,
            family: 'bearing-sideband', harmonic: h, sideband: sign * k,
            formula: `${formatNumber(h * orders.bpfi * r * referenceSpeedHz)} Hz ${sign < 0 ? '−' : '+'} ${k} × ${fr} Hz`,
          });
        }
      }
    }
    for (let h = 2; h <= Math.min(max['bearing-bsf'], max['bearing-sideband']); h += 2) {
      for (let k = 1; k <= bearingSidebands; k++) {
        for (const sign of [-1, 1]) {
          orderLine(h * orders.bsf * r + sign * k * orders.ftf * r, {
            ...base, label: `${h}×BSF ${bearing.id} ${sign < 0 ? '−' : '+'} ${times(k, 'FTF')}`,
            family: 'bearing-sideband', harmonic: h, sideband: sign * k,
            formula: `${formatNumber(h * orders.bsf * r * referenceSpeedHz)} Hz ${sign < 0 ? '−' : '+'} ${k} × ${formatNumber(orders.ftf * r * referenceSpeedHz)} Hz`,
          });
        }
      }
    }
  }

  for (const rotor of model.rotors) {
    const r = ratio.get(rotor.shaft)!;
    for (let h = 1; h <= max['blade-pass']; h++) {
      // Common practice: blade (vane) pass frequency = blades × shaft speed.
      orderLine(h * rotor.blades * r, {
        label: `${times(h, 'blade pass')} ${rotor.id}`, component: rotor.id, componentKind: 'rotor', family: 'blade-pass', harmonic: h,
        shaft: rotor.shaft, formula: `${h === 1 ? '' : `${h} × `}${rotor.blades} blades × ${formatNumber(hz(rotor.shaft))} Hz`,
      });
    }
  }

  for (const belt of model.belts) {
    if (belt.beltLengthMm === undefined) continue;
    const driverHz = hz(belt.driver.shaft);
    const bpHz = beltPassFrequencyHz(belt.driver.pitchDiameterMm, driverHz, belt.beltLengthMm);
    for (let h = 1; h <= max['belt-pass']; h++) {
      orderLine((h * bpHz) / referenceSpeedHz, {
        label: `${times(h, 'belt pass')} ${belt.id}`, component: belt.id, componentKind: 'belt', family: 'belt-pass', harmonic: h,
        shaft: belt.driver.shaft,
        formula: `${h === 1 ? '' : `${h} × `}π × ${formatNumber(belt.driver.pitchDiameterMm)} mm × ${formatNumber(driverHz)} Hz / ${formatNumber(belt.beltLengthMm)} mm`,
      });
    }
  }

  if (model.motor) {
    const m = model.motor;
    const id = motorComponentId(m);
    const base = { component: id, componentKind: 'motor' as const };
    const rotorHz = hz(m.shaft);
    for (let h = 1; h <= max['line-frequency']; h++) {
      // Common practice: magnetic force pulses twice per line cycle (2 × line frequency).
      fixedLine(2 * h * m.lineFrequencyHz, {
        ...base, label: `${times(h, '2× line frequency')}`, family: 'line-frequency', harmonic: h,
        formula: `${2 * h} × ${formatNumber(m.lineFrequencyHz)} Hz`,
      });
    }
    const syncHz = synchronousSpeedHz(m.lineFrequencyHz, m.poles);
    if (max['synchronous-speed'] >= 1) {
      fixedLine(syncHz, {
        ...base, label: 'synchronous speed', family: 'synchronous-speed', harmonic: 1, shaft: m.shaft,
        formula: `120 × ${formatNumber(m.lineFrequencyHz)} Hz / ${m.poles} poles = ${formatNumber(syncHz * 60)} rpm`,
      });
    }
    const slipHz = slipFrequencyHz(m.lineFrequencyHz, m.poles, rotorHz);
    if (max.slip >= 1) {
      fixedLine(slipHz, {
        ...base, label: 'slip frequency', family: 'slip', harmonic: 1, shaft: m.shaft,
        formula: `${formatNumber(syncHz)} Hz synchronous − ${formatNumber(rotorHz)} Hz rotor`,
      });
    }
    const ppHz = polePassFrequencyHz(m.lineFrequencyHz, m.poles, rotorHz);
    if (max['pole-pass'] >= 1 && ppHz > 0) {
      fixedLine(ppHz, {
        ...base, label: 'pole pass frequency', family: 'pole-pass', harmonic: 1, shaft: m.shaft,
        formula: `${m.poles} poles × ${formatNumber(slipHz)} Hz slip`,
      });
      // Common practice: rotor-bar faults show as pole-pass sidebands around 1× of the motor.
      for (const sign of [-1, 1]) {
        fixedLine(rotorHz + sign * ppHz, {
          ...base, label: `1× ${m.shaft} ${sign < 0 ? '−' : '+'} pole pass`, family: 'pole-pass', harmonic: 1, sideband: sign,
          shaft: m.shaft, formula: `${formatNumber(rotorHz)} Hz ${sign < 0 ? '−' : '+'} ${formatNumber(ppHz)} Hz`,
        });
      }
    }
  }
  return lines;
}
