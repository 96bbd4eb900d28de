import { shaftRatios, type MachineModel, type Point } from '@kinespec/kinematics';
import { convertUnit, quantityOfUnit } from '@kinespec/signal';
import { faultCandidates, predictSignature, type FaultCandidate, type Signature, type SignatureLine } from '@kinespec/signatures';
import type { Candidate } from './hypothesis-score.js';
import type { ExpectedLine } from './line-matching.js';
import { modelKey } from './model-key.js';

export interface CandidateLimits {
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
const BEARING_SLIP_FRACTION = 0.015;

/**
 * Depth of the mesh-torque drop each tooth fault stands for: all of it while a missing tooth should be in mesh,
 * half of it for a broken or chipped tooth (the defaults of @kinespec/signatures, passed explicitly here
 * because the tooth-fault level test compares the measured depth with them).
 */
export const TOOTH_DROP_DEPTH = { 'gear-missing-tooth': 1, 'gear-broken-tooth': 0.5 } as const;

/**
 * Mesh-frequency ripple (transmission error) assumed under a tooth fault, as a fraction of the mean mesh torque:
 * every real mesh has one, and the fault's sidebands around the mesh frequency are its modulation (common
 * practice; Randall 2011 ch. 2, from memory). 0.1 is the ripple @kinespec/signatures assumes for its eccentricity
 * and wear templates; without it the prediction holds only the comb of the torque drop itself.
 */
export const MESH_RIPPLE_FRACTION = 0.1;

/**
 * Every (fault, component) candidate of the model with its predicted lines at the running speed
 * (@kinespec/signatures predictSignature at the measurement point), kept to the lines the spectra can show,
 * in the unit of the channel analysed.
 */
export function buildCandidates(model: MachineModel, point: Point, speedHz: number, unit: string, limits: CandidateLimits, warnings: string[]): Candidate[] {
  const meshOfGear = new Map<string, string[]>();
  for (const m of model.gearMeshes) for (const g of [m.driver.gear, m.driven.gear]) meshOfGear.set(g, [...(meshOfGear.get(g) ?? []), m.id]);
  const rotorShaft = new Map(model.rotors.map((r) => [r.id, r.shaft]));
  const rotorsOn = (shaft: string) => model.rotors.filter((r) => r.shaft === shaft).map((r) => r.id);
  // shaftRatios throws MachineModelError for a model the validator rejects, before any prediction.
  const ratio = new Map(shaftRatios(model).map((r) => [r.shaft, r.ratio]));
  const pointShaft = point.shaft ?? model.bearings.find((b) => b.id === point.near)?.shaft ?? model.speed.shaft;
  const out: Candidate[] = [];
  for (const p of predictions(model, point, speedHz)) {
    if ('error' in p) {
      warnings.push(`no signature for ${p.fault} in ${p.component}: ${p.error}`);
      continue;
    }
    const { candidate: c, signature } = p;
    const domain = signature.domain;
    const [lowHz, topHz] = domain === 'envelope' ? [limits.envelopeLowHz, limits.envelopeTopHz] : [limits.spectrumLowHz, limits.spectrumTopHz];
    const scale = unitScale(signature.unit, unit);
    const spread = c.fault.startsWith('bearing-') ? BEARING_SLIP_FRACTION : 0;
    // Lines at fixed frequencies (twice line frequency) do not move with a speed error, nor with the speed step.
    const fixed = signature.fixedFrequency;
    const stretch = fixed ? 1 : p.speedRatio;
    // The lines the spectrum can show, strongest first (the cached lines are sorted so already).
    const lines: ExpectedLine[] = [];
    for (const l of signature.lines) {
      if (lines.length >= limits.maxLines) break;
      const frequencyHz = l.frequencyHz * stretch;
      if (frequencyHz >= lowHz && frequencyHz <= topHz) {
        lines.push({ frequencyHz, amplitude: l.amplitude * scale, label: l.label, order: fixed ? 0 : frequencyHz / speedHz, relativeSpreadFraction: spread });
      }
    }
    let context: string;
    const own = new Set<string>([c.component]);
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
        for (const m of meshOfGear.get(c.component) ?? []) own.add(m);
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
    const ownsRunningLines = ['unbalance', 'misalignment', 'looseness', 'gear-wear', 'electrical'].includes(c.fault);
    const kind = c.componentKind === 'rotor' ? 'shaft' : c.componentKind === 'gear-mesh' ? 'mesh' : c.componentKind;
    const atPoint = c.componentKind === 'bearing' ? point.near === c.component : c.shaft === pointShaft;
    out.push({ fault: c.fault, component: c.component, domain, lines, context, own, ownsRunningLines, kind, shaftRatio: ratio.get(c.shaft) ?? 1, atPoint });
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
          ...(candidate.fault === 'gear-missing-tooth' || candidate.fault === 'gear-broken-tooth' ? { depthFraction: TOOTH_DROP_DEPTH[candidate.fault], rippleFraction: MESH_RIPPLE_FRACTION } : {}),
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
