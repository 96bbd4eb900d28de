import { bearingFaultOrders, shaftRatios, type BearingFaultOrders, type MachineModel, type Point } from '@kinespec/kinematics';
import { convertUnit, quantityOfUnit } from '@kinespec/signal';
import { faultCandidates, predictSignature, type FaultCandidate, type Signature, type SignatureLine } from '@kinespec/signatures';
import { faultDescriptors } from './faults/descriptors.js';
import type { FaultDescriptor } from './faults/fault-descriptor.js';
import type { ExpectedLine } from './line-matching.js';
import { modelKey } from './model-key.js';

/** A fault hypothesis ready to be judged: its predicted lines on one spectrum and what it is. */
export interface Candidate {
  fault: string;
  component: string;
  descriptor: FaultDescriptor;
  domain: 'spectrum' | 'envelope';
  /** Predicted lines the spectrum can show, strongest first, in the channel's unit (envelope: unit²). */
  lines: ExpectedLine[];
  /** Candidates with the same context compete for the same lines (one shaft, one gear, one bearing). */
  context: string;
  /** Components whose catalogue lines are this candidate's own (never make its lines ambiguous). */
  own: ReadonlySet<string>;
  /** What the component is, for telling a twin (an identical component at the same speed) from another fault. */
  kind: 'shaft' | 'gear' | 'mesh' | 'bearing' | 'motor';
  /** The shaft the component turns with, and its speed over the reference shaft's. */
  shaft: string;
  shaftRatio: number;
  /** The component is the one the sensor sits on (its bearing, its shaft): preferred over an identical twin elsewhere. */
  atPoint: boolean;
  /** Components that are the same physical part or identical to it where they sit, named with it (one report). */
  twins: string[];
  /** A bearing's defect orders (of its shaft), for its envelope comb. */
  bearingOrders?: BearingFaultOrders;
}

export interface CandidateLimits {
  /** Bin spacing of the spectrum the spectrum-domain lines are read in, Hz. */
  spectrumResolutionHz: number;
  /** Highest and lowest frequency each spectrum can show a line at. */
  spectrumTopHz: number;
  spectrumLowHz: number;
  envelopeTopHz: number;
  envelopeLowHz: number;
  /** At most this many lines per candidate, the strongest predicted ones (keeps matching fast). */
  maxLines: number;
}

/**
 * Rolling elements slip: bearing defect frequencies differ from the kinematic ones by 1–2 %
 * (Randall & Antoni, MSSP 25:485–520, 2011, §2.1), so bearing lines get this much spread of their own.
 */
export const BEARING_SLIP_FRACTION = 0.015;

/**
 * Faults judged by the presence of running lines (unbalance, misalignment, looseness, wear) have no chance of the
 * pattern to weigh them (a 1× is in every spectrum), so where each line lies is their test: a running line is where
 * the measured speed puts it. The interpolated frequency of a tone in a Hann-windowed spectrum scatters by about 0.18
 * bin at 10 dB over the floor and 0.05 bin at 20 dB (simulated in line-matching.test.ts, 2.4–2.6 times the Cramér–Rao
 * bound of Rife & Boorstyn 1974), so half a bin, beyond the speed's uncertainty, is about three standard deviations at
 * 10 dB, and toneFrequencySigmaBins narrows it for stronger lines: a peak further off is another tone (noise near DC,
 * a neighbouring machine). This holds
 * for a tone whose neighbours lie outside its main lobe: the shaft's harmonics must be ISOLATED_LINE_BINS apart (the
 * Hann main lobe spans ±2 bins; Harris 1978), else their lobes merge, bias the interpolation and keep the full bin
 * (a pattern of one line, unbalance's 1×, has no neighbours of its own).
 * Lines at fixed frequencies (twice line frequency) keep the full bin too: the grid frequency wanders.
 */
export const RUNNING_LINE_TOLERANCE_BINS = 0.5;
export const ISOLATED_LINE_BINS = 4;

/**
 * One candidate per physical part and fault (@kinespec/signatures faultCandidates, each predicted with
 * predictSignature at the measurement point and running speed), kept to the lines the spectra can show, in the unit
 * of the channel analysed. One physical part is one candidate:
 * - the unbalance of a shaft that carries one rotor is the rotor's (the 1× cannot tell them apart; the rotor is what
 *   is balanced), and a shaft with several rotors keeps the shaft's, naming them;
 * - bearings of one geometry on one shaft show the same lines at the same speed: one candidate per fault for the
 *   group, named after the bearing the point is near (else the first in the model), the others its twins.
 */
export function buildCandidates(model: MachineModel, point: Point, speedHz: number, unit: string, limits: CandidateLimits, warnings: string[]): Candidate[] {
  const meshOfGear = new Map<string, string[]>();
  for (const m of model.gearMeshes) for (const g of [m.driver.gear, m.driven.gear]) meshOfGear.set(g, [...(meshOfGear.get(g) ?? []), m.id]);
  const rotorShaft = new Map(model.rotors.map((r) => [r.id, r.shaft]));
  const rotorsOn = (shaft: string) => model.rotors.filter((r) => r.shaft === shaft).map((r) => r.id);
  // shaftRatios throws MachineModelError for a model the validator rejects, before any prediction.
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  const pointShaft = point.shaft ?? model.bearings.find((b) => b.id === point.near)?.shaft ?? model.speed.shaft;
  const bearingGroups = twinBearings(model, point, ratio, pointShaft);
  const gearGroups = twinGears(model, ratio, pointShaft);
  const sameSpeedShafts = groupsOf(model.shafts.map((sh) => sh.id), (sh) => (ratio.get(sh) ?? 1).toPrecision(9), (members) => (members.includes(pointShaft) ? pointShaft : members[0]!));
  const out: Candidate[] = [];
  for (const p of predictions(model, point, speedHz)) {
    if ('error' in p) {
      warnings.push(`no signature for ${p.fault} in ${p.component}: ${p.error}`);
      continue;
    }
    const { candidate: c, signature } = p;
    let twins: string[] = [];
    if (c.componentKind === 'shaft' || c.componentKind === 'rotor') {
      const rotors = rotorsOn(c.shaft);
      // The unbalance of a shaft that carries one rotor is the rotor's; a shaft with several keeps the shaft's.
      if (c.componentKind === 'shaft' && c.fault === 'unbalance' && rotors.length === 1) continue;
      if (c.componentKind === 'rotor' && rotors.length > 1) continue;
      // Shafts at the same speed (a 1:1 pair of timing gears) show the same running lines: one report, at the point's shaft.
      const group = sameSpeedShafts.get(c.shaft)!;
      if (group.representative !== c.shaft) continue;
      const others = group.members.filter((m) => m !== c.shaft);
      const rotorTwins = c.fault === 'unbalance' ? others.flatMap((m) => [...rotorsOn(m), m]) : others;
      twins = [...(c.componentKind === 'rotor' ? [c.shaft] : c.fault === 'unbalance' ? rotors : []), ...rotorTwins];
    }
    if (c.componentKind === 'gear') {
      const group = gearGroups.get(c.component);
      if (group && group.representative !== c.component) continue;
      twins = group ? group.members.filter((m) => m !== c.component) : [];
    }
    if (c.componentKind === 'bearing') {
      const group = bearingGroups.get(c.component);
      if (!group || group.representative !== c.component) continue;
      twins = group.members.filter((m) => m !== c.component);
    }
    const descriptor = faultDescriptors[c.fault];
    const domain = descriptor.domain;
    const [lowHz, topHz] = domain === 'envelope' ? [limits.envelopeLowHz, limits.envelopeTopHz] : [limits.spectrumLowHz, limits.spectrumTopHz];
    const scale = unitScale(signature.unit, unit);
    const spread = domain === 'envelope' ? BEARING_SLIP_FRACTION : 0;
    // Lines at fixed frequencies (twice line frequency) do not move with a speed error, nor with the speed step.
    const fixed = signature.fixedFrequency;
    const stretch = fixed ? 1 : p.speedRatio;
    const isolated = (ratio.get(c.shaft) ?? 1) * speedHz >= ISOLATED_LINE_BINS * limits.spectrumResolutionHz;
    // The lines the spectrum can show, strongest first (the cached lines are sorted so already).
    const lines: ExpectedLine[] = [];
    for (const l of signature.lines) {
      if (lines.length >= limits.maxLines) break;
      const frequencyHz = l.frequencyHz * stretch;
      if (frequencyHz >= lowHz && frequencyHz <= topHz) {
        lines.push({ frequencyHz, amplitude: l.amplitude * scale, label: l.label, order: fixed ? 0 : frequencyHz / speedHz, relativeSpreadFraction: spread });
      }
    }
    // A lone line (unbalance's 1×) has no neighbours of its own to merge with.
    if (descriptor.evidence === 'presence' && !fixed && (isolated || lines.length === 1)) {
      for (const l of lines) {
        l.toleranceBins = RUNNING_LINE_TOLERANCE_BINS;
        l.snrTolerance = true;
      }
    }
    let context: string;
    const own = new Set<string>([c.component, ...twins]);
    switch (c.componentKind) {
      case 'rotor':
        context = `shaft:${rotorShaft.get(c.component)}`;
        own.add(rotorShaft.get(c.component)!);
        break;
      case 'shaft':
        context = `shaft:${c.component}`;
        for (const r of rotorsOn(c.component)) own.add(r);
        break;
      case 'gear':
        context = `gear:${c.component}`;
        for (const g of [c.component, ...twins]) for (const m of meshOfGear.get(g) ?? []) own.add(m);
        break;
      case 'gear-mesh':
        context = `mesh:${c.component}`;
        break;
      case 'bearing':
        context = `bearing:${c.component}`;
        break;
      default:
        context = `motor:${c.component}`;
    }
    const kind = c.componentKind === 'rotor' ? 'shaft' : c.componentKind === 'gear-mesh' ? 'mesh' : c.componentKind;
    const atPoint = c.componentKind === 'bearing' ? [c.component, ...twins].includes(point.near ?? '') : c.shaft === pointShaft;
    const bearing = c.componentKind === 'bearing' ? model.bearings.find((b) => b.id === c.component) : undefined;
    out.push({
      fault: c.fault, component: c.component, descriptor, domain, lines, context, own, kind, shaft: c.shaft,
      shaftRatio: ratio.get(c.shaft) ?? 1, atPoint, twins, ...(bearing ? { bearingOrders: bearingFaultOrders(bearing) } : {}),
    });
  }
  return out;
}

/**
 * Groups of bearings whose defect lines fall at the same frequencies (the same defect orders on shafts turning at the
 * same speed), each with the member that stands for it: the bearing the point is near, else one on the point's shaft,
 * else the first in the model.
 */
function twinBearings(model: MachineModel, point: Point, ratio: ReadonlyMap<string, number>, pointShaft: string): Map<string, { representative: string; members: string[] }> {
  const shaftOf = new Map(model.bearings.map((b) => [b.id, b.shaft]));
  return groupsOf(
    model.bearings.map((b) => b.id),
    (id) => {
      const b = model.bearings.find((x) => x.id === id)!;
      const o = bearingFaultOrders(b);
      const r = ratio.get(b.shaft) ?? 1;
      return [o.bpfo, o.bpfi, o.bsf, o.ftf].map((x) => (x * r).toPrecision(9)).join('|');
    },
    (members) => (members.includes(point.near ?? '') ? point.near! : members.find((m) => shaftOf.get(m) === pointShaft) ?? members[0]!),
  );
}

/**
 * Groups of gears whose tooth-fault lines fall at the same frequencies: the same mesh frequency (teeth × shaft speed)
 * and the same sideband spacing (shaft speed), as the two gears of a 1:1 pair of timing gears. A tooth fault of one
 * cannot be told from the other's by frequency: one candidate per group, named after the gear on the point's shaft
 * (the nearer gear), else the first in the model, the others its twins.
 */
function twinGears(model: MachineModel, ratio: ReadonlyMap<string, number>, pointShaft: string): Map<string, { representative: string; members: string[] }> {
  const gears = new Map<string, { shaft: string; teeth: number }>();
  for (const m of model.gearMeshes) for (const g of [m.driver, m.driven]) gears.set(g.gear, { shaft: g.shaft, teeth: g.teeth });
  return groupsOf(
    [...gears.keys()],
    (id) => {
      const g = gears.get(id)!;
      const r = ratio.get(g.shaft) ?? 1;
      return `${r.toPrecision(9)}|${(r * g.teeth).toPrecision(9)}`;
    },
    (members) => members.find((m) => gears.get(m)!.shaft === pointShaft) ?? members[0]!,
  );
}

/** Partitions ids by a key, each group with the member `pick` chooses to stand for it. */
function groupsOf(ids: readonly string[], key: (id: string) => string, pick: (members: string[]) => string): Map<string, { representative: string; members: string[] }> {
  const groups = new Map<string, string[]>();
  for (const id of ids) groups.set(key(id), [...(groups.get(key(id)) ?? []), id]);
  const out = new Map<string, { representative: string; members: string[] }>();
  for (const members of groups.values()) {
    const representative = pick(members);
    for (const m of members) out.set(m, { representative, members });
  }
  return out;
}

type Prediction =
  | { candidate: FaultCandidate; signature: PredictedLines; speedRatio: number }
  | { fault: string; component: string; error: string };

/**
 * What the analysis reads of a predicted signature, and all the cache keeps of it (a whole Signature, with its
 * excitation and every line's derivation, takes some 30 kB): the lines of positive amplitude, strongest first
 * (a stable sort, so equal amplitudes keep the signature's order).
 */
interface PredictedLines {
  domain: 'spectrum' | 'envelope';
  unit: string;
  /** The excitation has no fundamental order: its lines sit at fixed frequencies (twice line frequency). */
  fixedFrequency: boolean;
  lines: Array<Pick<SignatureLine, 'frequencyHz' | 'amplitude' | 'label'>>;
}

function predictedLines(signature: Signature): PredictedLines {
  return {
    domain: signature.domain === 'envelope' ? 'envelope' : 'spectrum',
    unit: signature.unit,
    fixedFrequency: signature.excitation.fundamentalOrder === null,
    lines: signature.lines
      .filter((l) => l.amplitude > 0)
      .sort((a, b) => b.amplitude - a.amplitude)
      .map((l) => ({ frequencyHz: l.frequencyHz, amplitude: l.amplitude, label: l.label })),
  };
}

/**
 * Predicted signatures are made at speeds on a 1 % grid and kept (at most CACHE_SIZE model-point-speed entries):
 * predicting every candidate through the torsional chain takes far longer than analysing a recording, and the
 * lines of a fault are fixed orders, so a prediction 0.5 % off in speed is stretched onto the measured speed
 * exactly; only the response at each line (its amplitude) is read at up to 0.5 % off its frequency. The result
 * depends only on the inputs, never on what was cached before.
 */
const SPEED_STEP = 0.01;
/** About 0.3 MB each (36 candidates of a gearbox): some 55 MB for a worker that sees many machines. */
const CACHE_SIZE = 192;
const cache = new Map<string, Prediction[]>();

function predictions(model: MachineModel, point: Point, speedHz: number): Prediction[] {
  const step = Math.round(Math.log(speedHz) / Math.log1p(SPEED_STEP));
  const gridHz = Math.exp(step * Math.log1p(SPEED_STEP));
  const key = `${point.id}|${step}|${modelKey(model)}`;
  let list = cache.get(key);
  if (list) {
    // Refresh its place: the map keeps insertion order, the oldest entry is evicted first.
    cache.delete(key);
  } else {
    list = faultCandidates(model).map((candidate): Prediction => {
      try {
        const signature = predictSignature(model, {
          fault: candidate.fault,
          component: candidate.component,
          speedRpm: gridHz * 60,
          point: point.id,
          ...faultDescriptors[candidate.fault].prediction,
        });
        return { candidate, signature: predictedLines(signature), speedRatio: 1 };
      } catch (err) {
        return { fault: candidate.fault, component: candidate.component, error: err instanceof Error ? err.message : String(err) };
      }
    });
    if (cache.size >= CACHE_SIZE) cache.delete(cache.keys().next().value!);
  }
  cache.set(key, list);
  return list.map((p) => ('error' in p ? p : { ...p, speedRatio: speedHz / gridHz }));
}

/** Factor from the signature's unit to the channel's; 1 when they measure different quantities (only ratios matter then). */
function unitScale(from: string, to: string): number {
  try {
    if (from === to) return 1;
    if (quantityOfUnit(from) !== quantityOfUnit(to)) return 1;
    return convertUnit(1, from, to);
  } catch {
    return 1;
  }
}
