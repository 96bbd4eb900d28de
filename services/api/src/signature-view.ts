import type { MachineModel } from '@kinespec/kinematics';
import {
  campbellData,
  faultCandidates,
  fourierSeries,
  evaluateSegments,
  partialSumWaveform,
  predictSignature,
  segmentsOrigin,
  type CampbellData,
  type FaultKind,
  type Segment,
  type Signature,
} from '@kinespec/signatures';

/*
 * What the signature explorer draws, put together from @kinespec/signatures: the predicted lines, the
 * excitation over one period of its fundamental with partial sums of its Fourier series, the
 * magnification of each line by the machine's response, and the Campbell data. Composition only; every
 * number comes from the package.
 */

/** Points over one period of the excitation for the waveform plots (a power of two, so N = 2^k partial sums peak on a sample). */
export const WAVEFORM_POINTS = 1024;
/** Partial sums sent when the request names none, together with the request's `harmonics`. */
export const DEFAULT_PARTIAL_SUMS = [1, 3, 10, 30] as const;
/** At most this many partial sums per request, each of at most this many harmonics: keeps the answer near 100 KB. */
export const MAX_PARTIAL_SUM_COUNT = 8;
export const MAX_PARTIAL_SUM_HARMONICS = 500;
/** Waveform values are sent with this many significant digits (plots, and the Gibbs peak to 1e-6 of the jump). */
const SIGNIFICANT_DIGITS = 6;

export interface SignatureRequest {
  fault: string;
  component: string;
  speedRpm?: number;
  point?: string;
  harmonics?: number;
  /** Harmonic counts of the partial sums to send (default DEFAULT_PARTIAL_SUMS and `harmonics`). */
  partialSums?: number[];
}

export interface ExcitationView {
  template: string;
  formula: string;
  reference: string;
  mean: number;
  /** The excitation's fundamental as an order of the reference shaft (null for fixed-frequency lines). */
  fundamentalOrder: number | null;
  modulationOrder: number | null;
  /** The shaft whose revolutions `angleRev` counts (the shaft the faulty component turns with). */
  shaft: string;
  /** One period of the excitation in revolutions of `shaft` (1 for a tooth fault, 1/BPFO for an outer race); null without a waveform. */
  periodRev: number | null;
  /** Sample angles over one period, in revolutions of `shaft`, the shortest feature (dip, impact) mid-period; empty for faults with no waveform (fixed lines). */
  angleRev: number[];
  /** The excitation evaluated exactly (piecewise segments) at `angleRev`, in units of `reference`. */
  waveform: number[];
  /** Partial sums a0 + Σ_{n≤N} A_n cos(2πnθ + φ_n) of the same waveform's Fourier series at `angleRev`, keyed by N. */
  partialSums: Record<string, number[]>;
}

/** The magnification of one predicted line (same order as `lines`, whose `label` names it). */
export interface MagnificationView {
  harmonic: number;
  sideband: number;
  frequencyHz: number;
  factor: number;
  torsional: number | null;
  structural: number | null;
}

/** The route's answer: the package's signature with the excitation sampled for plots, the magnifications and the Campbell data. */
export type SignatureView = Omit<Signature, 'excitation'> & { excitation: ExcitationView; magnification: MagnificationView[]; campbell: CampbellData };

const round = (v: number) => (v === 0 || !Number.isFinite(v) ? v : Number(v.toPrecision(SIGNIFICANT_DIGITS)));

/**
 * Where the plotted period starts: half a period before the middle of the shortest segment (the tooth dip,
 * the impact), so that feature sits mid-plot rather than split at the edge. Snapped to the sample grid that
 * starts at the segments' origin, where a jump usually is, so such a jump falls on a sample.
 */
function windowStart(segments: readonly Segment[]): number {
  const origin = segmentsOrigin(segments);
  const shortest = segments.reduce((a, b) => (b.endFraction - b.startFraction < a.endFraction - a.startFraction ? b : a));
  const wanted = (shortest.startFraction + shortest.endFraction) / 2 - 0.5;
  return origin + Math.round((wanted - origin) * WAVEFORM_POINTS) / WAVEFORM_POINTS;
}

/** The partial-sum counts to send: the requested ones, else the defaults and `harmonics`, ascending. */
export function partialSumCounts(request: Pick<SignatureRequest, 'harmonics' | 'partialSums'>): number[] {
  const wanted = request.partialSums && request.partialSums.length > 0
    ? request.partialSums
    : [...DEFAULT_PARTIAL_SUMS, ...(request.harmonics !== undefined ? [request.harmonics] : [])];
  return [...new Set(wanted)].sort((a, b) => a - b);
}

export function signatureView(model: MachineModel, request: SignatureRequest): SignatureView {
  const signature = predictSignature(model, {
    fault: request.fault as FaultKind,
    component: request.component,
    ...(request.speedRpm !== undefined ? { speedRpm: request.speedRpm } : {}),
    ...(request.point !== undefined ? { point: request.point } : {}),
    ...(request.harmonics !== undefined ? { harmonics: request.harmonics } : {}),
  });
  const { segments, ...excitationInfo } = signature.excitation;
  // the fundamental as an order of the fault's own shaft: the reference-shaft order over that shaft's speed ratio
  const shaftRatio = signature.shaftSpeedHz / (signature.speedRpm / 60);
  const baseOrder = excitationInfo.fundamentalOrder === null ? null : excitationInfo.fundamentalOrder / shaftRatio;
  let periodRev: number | null = null;
  let angleRev: number[] = [];
  let waveform: number[] = [];
  const partialSums: Record<string, number[]> = {};
  if (segments && segments.length > 0 && baseOrder !== null && baseOrder > 0) {
    periodRev = 1 / baseOrder;
    // The series of the very segments drawn, so each partial sum converges on the waveform shown (a template
    // may scale its lines' series, e.g. looseness to its strongest line; the waveform keeps the segments' units).
    const counts = partialSumCounts(request);
    const series = fourierSeries(segments, Math.max(...counts));
    const start = windowStart(segments);
    waveform = Array.from({ length: WAVEFORM_POINTS }, (_, i) => round(evaluateSegments(segments, start + i / WAVEFORM_POINTS)));
    angleRev = waveform.map((_, i) => round((start + i / WAVEFORM_POINTS) * periodRev!));
    for (const n of counts) {
      const w = partialSumWaveform(series, { harmonics: n, points: WAVEFORM_POINTS, startFraction: start });
      partialSums[String(n)] = Array.from(w.value, round);
    }
  }
  const magnification: MagnificationView[] = signature.lines.map((l) => ({
    harmonic: l.harmonic,
    sideband: l.sideband,
    frequencyHz: l.frequencyHz,
    factor: l.magnification,
    torsional: l.torsionalMagnification ?? null,
    structural: l.structuralMagnification ?? null,
  }));
  const orders = [...new Map(signature.lines.filter((l) => l.order > 0).map((l) => [l.order, { order: l.order, label: l.label }])).values()].slice(0, 12);
  const campbell = campbellData(model, orders.length > 0 ? { orders } : {});
  return {
    ...signature,
    excitation: { ...excitationInfo, shaft: signature.shaft, periodRev, angleRev, waveform, partialSums },
    magnification,
    campbell,
  };
}

export function faultList(model: MachineModel): Array<{ fault: string; component: string; componentKind: string; shaft: string }> {
  return faultCandidates(model);
}
