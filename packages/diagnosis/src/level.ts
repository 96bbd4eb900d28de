import { shaftRatios, type MachineModel } from '@kinespec/kinematics';
import { convertUnit, quantityOfUnit } from '@kinespec/signal';
import { TOOTH_DROP_DEPTH } from './faults/descriptors.js';
import type { Candidate } from './candidates.js';
import { lineToleranceHz, matchLine, type MatchableSpectrum } from './line-matching.js';
import type { RecordingAnalysis } from './recording-analysis.js';

/** A found line as the level reads it. */
export interface LevelLine {
  matched: boolean;
  measuredHz: number | null;
  measuredAmplitude: number | null;
  toleranceHz: number;
  predictedHz: number;
}

export interface LevelContext {
  model: MachineModel;
  /** Unit of the spectrum's values. */
  unit: string;
  isoAbMmPerS: number;
  isoBcMmPerS: number;
  baseline: RecordingAnalysis | null;
  /** Speed of the reference shaft in the spectrum's frequency unit (1 in the angle domain). */
  speedHz: number;
  measured: MatchableSpectrum;
  uncertaintyHz: number;
  /** Hz per unit of the spectrum's frequency axis (the mean speed in the angle domain, else 1). */
  unitHz: number;
  referenceSpeedHz: number;
  /** The point's healthy amplitudes at orders of the reference shaft, in the point's unit. */
  baselineOrders: ReadonlyArray<{ order: number; amplitude: number }> | null;
  pointUnit: string | null;
}

/**
 * How big the fault is, 0..1: against the machine's own baseline where there is one, else by the descriptor's rule.
 * A baseline analysis of the point (`options.baseline`) or the point's healthy orders (`baseline.orders`) judge the
 * rise of the matched lines: +12 dB (×4) counts fully (ISO 10816-3 criterion II in spirit: change matters).
 * `againstBaseline` says whether a baseline judged it: the baseline analysis held this hypothesis, or the point's
 * healthy orders held most of its matched power. A baseline that holds other orders (the mesh fundamental but not its
 * harmonics) does not judge it, and the descriptor's rule without a baseline applies.
 */
export function judgedLevel(candidate: Candidate, lines: readonly LevelLine[], context: LevelContext): { level: number; againstBaseline: boolean } {
  const plain = (level: number) => ({ level, againstBaseline: false });
  const judged = (level: number) => ({ level, againstBaseline: true });
  const matched = lines.filter((m) => m.matched && m.measuredAmplitude !== null);
  const orders = context.baselineOrders;
  // The model's own healthy amplitudes at chosen orders: only for faults judged by the size of lines every machine
  // shows (a defect line's presence needs no baseline), and only when they hold most of the candidate's matched power.
  if (!context.baseline && orders && orders.length > 0 && candidate.domain === 'spectrum' && candidate.descriptor.ownsRunningLines) {
    const scale = context.pointUnit && context.pointUnit !== context.unit ? safeScale(context.pointUnit, context.unit) : 1;
    let now = 0;
    let then = 0;
    const all = energy(matched.map((m) => m.measuredAmplitude!));
    for (const m of matched) {
      const order = (m.measuredHz! * context.unitHz) / context.referenceSpeedHz;
      const tolOrders = (m.toleranceHz * context.unitHz) / context.referenceSpeedHz;
      const b = orders.find((x) => Math.abs(x.order - order) <= tolOrders);
      if (!b) continue;
      now += m.measuredAmplitude! ** 2;
      then += (b.amplitude * scale) ** 2;
    }
    if (then > 0 && now >= 0.5 * all) return judged(riseLevel(now, then));
  }
  if (context.baseline) {
    const before = context.baseline.hypotheses.find((h) => h.fault === candidate.fault && h.component === candidate.component);
    if (before) {
      const now = energy(matched.map((m) => m.measuredAmplitude!));
      const then = energy(before.evidence.filter((e) => e.matched && e.measured !== null).map((e) => e.measured!));
      if (then > 0) return judged(riseLevel(now, then));
      return judged(now > 0 ? 1 : 0);
    }
  }
  switch (candidate.descriptor.level) {
    case 'mesh-harmonics':
      return plain(wearLevel(lines));
    case 'tooth-drop':
      return plain(toothDropLevel(candidate, TOOTH_DROP_DEPTH[candidate.fault as keyof typeof TOOTH_DROP_DEPTH] ?? 1, context));
    case 'iso-velocity':
      return plain(isoVelocityLevel(matched, context));
    case 'presence':
      return plain(1);
  }
}

/** +12 dB in the matched lines' power counts fully, no rise counts nothing. */
function riseLevel(now: number, then: number): number {
  return clamp01((10 * Math.log10(now / then)) / 12);
}

/**
 * Faults that every running machine shows a little of (residual unbalance, 1× and 2×, twice line frequency) count only
 * when their lines carry vibration that matters: their r.m.s. velocity on a log scale from the ISO 20816-3 A/B boundary
 * (nothing: a newly commissioned machine may vibrate that much) to the B/C boundary (all: beyond it the machine is
 * not fit for unrestricted long-term operation).
 */
function isoVelocityLevel(matched: readonly LevelLine[], context: LevelContext): number {
  const velocities = matched.map((m) => velocityRmsOfLine(m.measuredAmplitude!, m.measuredHz! * context.unitHz, context.unit));
  const v = Math.sqrt(energy(velocities));
  if (!(v > 0)) return 0;
  return clamp01(Math.log(v / context.isoAbMmPerS) / Math.log(context.isoBcMmPerS / context.isoAbMmPerS));
}

/**
 * Wear without a baseline: a healthy mesh's fundamental dominates its harmonics; wear of the profile raises 2× and
 * 3× mesh frequency (common practice, Randall 2011 ch. 2, from memory). Nothing counts while the larger harmonic is
 * 6 dB or more under the fundamental, everything once it reaches it (a judgement of this package, not a standard).
 */
function wearLevel(lines: readonly LevelLine[]): number {
  const byFrequency = [...lines].sort((a, b) => a.predictedHz - b.predictedHz);
  const first = byFrequency[0];
  if (!first || !first.matched) return byFrequency.some((m) => m.matched) ? 1 : 0;
  const harmonics = byFrequency.slice(1).map((m) => m.measuredAmplitude ?? 0);
  const largest = Math.max(0, ...harmonics);
  if (!(largest > 0)) return 0;
  const db = 20 * Math.log10(largest / first.measuredAmplitude!);
  return clamp01((db + 6) / 6);
}

/** Spread allowed between the measured and the predicted depth of a tooth drop (natural-log units, a factor 2). */
const DEPTH_SPREAD_LN = 0.7;
/** Depth (fraction of a full drop) from which the gear's own mesh counts as fully modulated. */
const OWN_MESH_DEPTH = 0.1;
/** Sidebands each side of the mesh line used for the depth, at most (and at most Z/2). */
const DEPTH_SIDEBANDS = 12;

/**
 * Which of the two tooth faults the depth of the mesh-torque drop fits better. A drop of depth d over one tooth
 * pitch (1/Z rev) of a gear amplitude-modulates its mesh line A: the k-th sidebands are A·d·sinc(k/Z)/Z (Fourier
 * series of a one-pitch rectangular gate; modulation sidebands, Randall 2011 ch. 2, from memory). d̂ is the
 * least-squares fit of that family to the sidebands k = 1..min(Z/2, 12) on both sides (an energy fit, so that families
 * of neighbouring mesh harmonics, which overlap with random phases, average out rather than decide).
 * fit = exp(−ln²(d̂/d)/(2·0.7²)) for d = 1 (missing) and 0.5 (broken); each hypothesis keeps fit/max(fit of both): the
 * depth chooses between them and never lowers the better of the two; both are scaled by min(1, d̂/0.1), since a tooth
 * fault must modulate its own mesh (a gear's comb of shaft harmonics is shared with every other gear on the same
 * shaft), and by its sideband-to-mesh-line ratio d̂/Z over the largest of the gears on that shaft (the most deeply
 * modulated mesh holds the fault). Without a measured mesh line it is 1.
 */
function toothDropLevel(candidate: Candidate, depth: number, context: LevelContext): number {
  const measuredDepth = toothDropDepth(candidate.component, context);
  if (measuredDepth === null) return 1;
  const fit = (d: number) => {
    const ln = Math.log(Math.max(measuredDepth, 1e-6) / d);
    return Math.exp(-(ln * ln) / (2 * DEPTH_SPREAD_LN * DEPTH_SPREAD_LN));
  };
  const best = Math.max(fit(TOOTH_DROP_DEPTH['gear-missing-tooth']), fit(TOOTH_DROP_DEPTH['gear-broken-tooth']));
  const { model } = context;
  const gears = model.gearMeshes.flatMap((m) => [m.driver, m.driven]);
  const shaft = gears.find((g) => g.gear === candidate.component)?.shaft;
  const siblings = gears.filter((g) => g.shaft === shaft && g.gear !== candidate.component);
  // Compared as sideband-to-mesh-line ratios (d̂/Z): a gear with many teeth would otherwise win on its tooth count.
  const own = measuredDepth / teethOf(model, candidate.component);
  const deepest = Math.max(own, ...siblings.map((g) => (toothDropDepth(g.gear, context) ?? 0) / g.teeth));
  const onOwnMesh = Math.min(1, measuredDepth / OWN_MESH_DEPTH) * (deepest > 0 ? own / deepest : 1);
  return (fit(depth) / best) * onOwnMesh;
}

function teethOf(model: MachineModel, gearId: string): number {
  return model.gearMeshes.flatMap((m) => [m.driver, m.driven]).find((g) => g.gear === gearId)?.teeth ?? 1;
}

/** The depth d̂ of a gear's tooth drop read from the sidebands of its mesh line (see toothDropLevel), or null. */
export function toothDropDepth(gearId: string, context: Pick<LevelContext, 'model' | 'speedHz' | 'measured' | 'uncertaintyHz'>): number | null {
  const { model, speedHz, measured, uncertaintyHz } = context;
  const memo = depthMemo.get(measured) ?? new Map<string, number | null>();
  depthMemo.set(measured, memo);
  if (memo.has(gearId)) return memo.get(gearId)!;
  let result: number | null = null;
  const mesh = model.gearMeshes.find((m) => m.driver.gear === gearId || m.driven.gear === gearId);
  if (mesh) {
    const gear = mesh.driver.gear === gearId ? mesh.driver : mesh.driven;
    const ratio = shaftRatios(model).find((r) => r.shaft === gear.shaft)!.ratio;
    const shaftHz = ratio * speedHz;
    const meshHz = gear.teeth * shaftHz;
    const df = measured.spectrum.frequencyResolutionHz;
    const match = (frequencyHz: number, order: number) => {
      const line = { frequencyHz, amplitude: 1, label: '', order };
      return matchLine(measured, line, lineToleranceHz(line, { frequencyResolutionHz: df, speedUncertaintyHz: uncertaintyHz }));
    };
    const carrier = match(meshHz, gear.teeth * ratio);
    if (carrier.matched) {
      let found = 0;
      let predicted = 0;
      for (let k = 1; k <= Math.min(DEPTH_SIDEBANDS, Math.floor(gear.teeth / 2)); k++) {
        const x = k / gear.teeth;
        const sinc = Math.sin(Math.PI * x) / (Math.PI * x);
        for (const sign of [-1, 1]) {
          const f = meshHz + sign * k * shaftHz;
          if (f <= 2 * df) continue;
          const m = match(f, (gear.teeth + sign * k) * ratio);
          const a = m.measuredAmplitude ?? 0;
          found += a * a;
          predicted += ((carrier.measuredAmplitude! * sinc) / gear.teeth) ** 2;
        }
      }
      if (predicted > 0 && found > 0) result = Math.sqrt(found / predicted);
    }
  }
  memo.set(gearId, result);
  return result;
}

const depthMemo = new WeakMap<MatchableSpectrum, Map<string, number | null>>();

function safeScale(from: string, to: string): number {
  try {
    return convertUnit(1, from, to);
  } catch {
    return 1;
  }
}

export function energy(amplitudes: readonly number[]): number {
  let s = 0;
  for (const a of amplitudes) s += a * a;
  return s;
}

/** RMS velocity (mm/s) of a line of peak amplitude `amplitude` in `unit` at `frequencyHz` (v = a/(2πf), common practice). */
export function velocityRmsOfLine(amplitude: number, frequencyHz: number, unit: string): number {
  const q = quantityOfUnit(unit);
  const rms = amplitude / Math.SQRT2;
  if (q === 'velocity') return convertUnit(rms, unit, 'mm/s');
  if (q === 'acceleration') return (convertUnit(rms, unit, 'm/s^2') / (2 * Math.PI * frequencyHz)) * 1000;
  return convertUnit(rms, unit, 'm') * 2 * Math.PI * frequencyHz * 1000;
}

function clamp01(x: number): number {
  return Number.isFinite(x) ? Math.min(1, Math.max(0, x)) : 0;
}
