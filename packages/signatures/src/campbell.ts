import { componentLines, speedRangeRpm, type LineFamily, type MachineModel } from '@kinespec/kinematics';
import { SignatureInputError } from './errors.js';
import { fmt } from './excitation.js';
import { RESONANCE_MARGIN_FRACTION } from './signature.js';
import { torsionalModel } from './torsional-model.js';

export interface CampbellOrder {
  /** Order of the reference shaft. */
  order: number;
  label: string;
}

export interface CampbellNaturalFrequency {
  frequencyHz: number;
  dampingRatio: number;
  source: 'torsional' | 'structural';
  /** e.g. "torsional mode 1", "resonance at point gb-input-h". */
  label: string;
}

export interface CampbellCrossing {
  order: number;
  orderLabel: string;
  naturalFrequencyHz: number;
  naturalFrequencyLabel: string;
  /** Reference-shaft speed at which order × speed equals the natural frequency. */
  speedRpm: number;
  /** The crossing lies within ±10 % of the nominal speed (common practice margin). */
  nearNominal: boolean;
}

export interface CampbellData {
  referenceShaft: string;
  speedRangeRpm: { minRpm: number; maxRpm: number };
  nominalRpm: number;
  naturalFrequencies: CampbellNaturalFrequency[];
  /** Each order as a straight line through the origin: its frequency at both ends of the range. */
  orders: Array<CampbellOrder & { frequencyHzAtMin: number; frequencyHzAtMax: number }>;
  /** Lines that do not follow the speed (electrical), horizontal on the diagram. */
  fixedLines: Array<{ frequencyHz: number; label: string }>;
  /** Every order line that meets a natural frequency inside the speed range, lowest speed first. */
  crossings: CampbellCrossing[];
}

/** The excitation families a Campbell diagram shows by default (first harmonics of each source). */
const DEFAULT_FAMILIES: ReadonlySet<LineFamily> = new Set<LineFamily>(['shaft-harmonic', 'gear-mesh', 'bearing-bpfo', 'bearing-bpfi', 'bearing-bsf', 'bearing-ftf', 'blade-pass', 'belt-pass', 'line-frequency']);

/**
 * Data for a Campbell (interference) diagram: the natural frequencies (torsional modes, points' structural
 * resonances) against the excitation orders over the speed range, and where they cross. Natural frequencies
 * are taken as independent of speed (no gyroscopic or centrifugal stiffening in a torsional chain).
 * Default orders: 1× and 2× of every shaft, 1× and 2× mesh, the bearing defect orders, blade and belt pass,
 * from @kinespec/kinematics componentLines; the speed range is the model's (min..max rpm, or 0..1.25 × nominal
 * when the model gives none).
 */
export function campbellData(
  model: MachineModel,
  options: { orders?: ReadonlyArray<number | CampbellOrder>; speedRangeRpm?: { minRpm: number; maxRpm: number } } = {},
): CampbellData {
  const range = speedRangeRpm(model);
  const given = options.speedRangeRpm;
  let minRpm = given?.minRpm ?? range.minRpm;
  let maxRpm = given?.maxRpm ?? range.maxRpm;
  if (!given && minRpm === maxRpm) {
    minRpm = 0;
    maxRpm = 1.25 * range.nominalRpm;
  }
  if (!(minRpm >= 0) || !(maxRpm > minRpm) || !Number.isFinite(maxRpm)) {
    throw new SignatureInputError('invalid_parameter', `speedRangeRpm (${minRpm}..${maxRpm}) must have 0 <= minRpm < maxRpm, both finite`);
  }

  const naturalFrequencies: CampbellNaturalFrequency[] = [];
  const tm = torsionalModel(model);
  tm?.modes.modes.filter((m) => !m.rigidBody).forEach((m, i) => naturalFrequencies.push({
    frequencyHz: m.naturalFrequencyHz, dampingRatio: m.dampingRatio, source: 'torsional', label: `torsional mode ${i + 1}`,
  }));
  for (const p of model.points) {
    for (const r of p.resonances ?? []) {
      naturalFrequencies.push({ frequencyHz: r.frequencyHz, dampingRatio: r.dampingRatio, source: 'structural', label: `resonance at point ${p.id}` });
    }
  }

  const nominalHz = range.nominalRpm / 60;
  let orders: CampbellOrder[];
  const fixedLines: CampbellData['fixedLines'] = [];
  if (options.orders) {
    orders = options.orders.map((o, i) => {
      const x = typeof o === 'number' ? { order: o, label: `${fmt(o)}×` } : o;
      if (!(x.order > 0) || !Number.isFinite(x.order)) throw new SignatureInputError('invalid_parameter', `orders[${i}] (${x.order}) must be a finite number > 0`);
      return x;
    });
  } else {
    const lines = componentLines(model, nominalHz, {
      maxHarmonic: { 'shaft-harmonic': 2, 'gear-mesh': 2, 'mesh-sideband': 0, 'hunting-tooth': 0, 'assembly-phase': 0, 'bearing-bpfo': 1, 'bearing-bpfi': 1, 'bearing-bsf': 1, 'bearing-ftf': 1, 'bearing-sideband': 0, 'blade-pass': 1, 'belt-pass': 1, 'line-frequency': 1, 'synchronous-speed': 0, 'slip': 0, 'pole-pass': 0 },
    }).filter((l) => DEFAULT_FAMILIES.has(l.family));
    const seen = new Set<string>();
    orders = [];
    for (const l of lines) {
      if (!l.scalesWithSpeed) { fixedLines.push({ frequencyHz: l.frequencyHz, label: l.label }); continue; }
      const key = l.order.toPrecision(10);
      if (seen.has(key)) continue;
      seen.add(key);
      orders.push({ order: l.order, label: l.label });
    }
  }

  const crossings: CampbellCrossing[] = [];
  for (const o of orders) {
    for (const n of naturalFrequencies) {
      const rpm = (60 * n.frequencyHz) / o.order;
      if (rpm < minRpm || rpm > maxRpm) continue;
      crossings.push({
        order: o.order, orderLabel: o.label, naturalFrequencyHz: n.frequencyHz, naturalFrequencyLabel: n.label, speedRpm: rpm,
        nearNominal: Math.abs(rpm - range.nominalRpm) <= RESONANCE_MARGIN_FRACTION * range.nominalRpm,
      });
    }
  }
  crossings.sort((a, b) => a.speedRpm - b.speedRpm);
  return {
    referenceShaft: model.speed.shaft,
    speedRangeRpm: { minRpm, maxRpm },
    nominalRpm: range.nominalRpm,
    naturalFrequencies,
    orders: orders.map((o) => ({ ...o, frequencyHzAtMin: (o.order * minRpm) / 60, frequencyHzAtMax: (o.order * maxRpm) / 60 })),
    fixedLines,
    crossings,
  };
}
