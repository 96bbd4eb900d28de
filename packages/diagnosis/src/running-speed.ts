import { componentLines, type MachineModel } from '@kinespec/kinematics';
import { modelKey } from './model-key.js';
import { DiagnosisInputError } from './errors.js';
import { peakAt, type MatchableSpectrum } from './line-matching.js';

/** A line whose frequency is a fixed order of the reference shaft, used to find the speed. */
interface SpeedLine {
  order: number;
  label: string;
}

export interface SpectrumSpeed {
  speedHz: number;
  /** Standard uncertainty of speedHz. */
  uncertaintyHz: number;
  /** Lines that stood above the noise at the speed found (label, order, measured frequency). */
  support: Array<{ label: string; order: number; frequencyHz: number; snrDb: number }>;
  /** The search range actually used, Hz. */
  searchRangeHz: [number, number];
}

export interface SpectrumSpeedOptions {
  /** Reference-shaft speeds to search, Hz. */
  searchRangeHz: [number, number];
  /** A line supports a speed when it stands this far above the floor (default 6 dB). */
  minSnrDb?: number;
  /** The speed the machine usually runs at (nominal): preferred unless a speed elsewhere in the range fits 1.5 times better. */
  preferredHz?: number;
}

/** Half-width of the window around the preferred speed, as a fraction of it. */
const PREFERRED_FRACTION = 0.04;
/** How much better a speed outside that window must fit to be taken instead. */
const FAR_SPEED_MARGIN = 1.5;

/** Speed lines per model (they depend on nothing else); at most SPEED_LINES_KEPT models. */
const speedLinesOf = new Map<string, readonly SpeedLine[]>();
const SPEED_LINES_KEPT = 256;

/** Orders of the lines every machine of this model shows when running: 1×–3× of each shaft, mesh and blade pass. */
function speedLines(model: MachineModel): readonly SpeedLine[] {
  const key = modelKey(model);
  let lines = speedLinesOf.get(key);
  if (!lines) {
    lines = computeSpeedLines(model);
    if (speedLinesOf.size >= SPEED_LINES_KEPT) speedLinesOf.delete(speedLinesOf.keys().next().value!);
    speedLinesOf.set(key, lines);
  }
  return lines;
}

function computeSpeedLines(model: MachineModel): SpeedLine[] {
  const catalogue = componentLines(model, 1, {
    maxHarmonic: {
      'shaft-harmonic': 3, 'gear-mesh': 3, 'mesh-sideband': 0, 'hunting-tooth': 0, 'assembly-phase': 0,
      'bearing-bpfo': 0, 'bearing-bpfi': 0, 'bearing-bsf': 0, 'bearing-ftf': 0, 'bearing-sideband': 0,
      'blade-pass': 2, 'belt-pass': 0, 'line-frequency': 0, 'synchronous-speed': 0, slip: 0, 'pole-pass': 0,
    },
    sidebands: 0,
    bearingSidebands: 0,
  });
  const seen = new Map<string, SpeedLine>();
  for (const line of catalogue) {
    if (!line.scalesWithSpeed) continue;
    const key = line.order.toFixed(6);
    if (!seen.has(key)) seen.set(key, { order: line.order, label: line.label });
  }
  return [...seen.values()];
}

/**
 * The running speed of the reference shaft from the spectrum alone: the speed within the search range at which
 * the model's own running lines (shaft harmonics, mesh frequencies, blade pass) coincide best with measured peaks.
 * A grid search on a summed, clipped SNR comb (fine enough that the highest order moves a quarter bin per step),
 * then a least-squares fit of speed × order to the interpolated frequencies of the supporting peaks.
 * Returns null when no running line stands above the noise anywhere in the range.
 */
// Comb (harmonic-sum) speed estimation, common practice; least squares: f_i = o_i·s gives s = Σ o_i f_i / Σ o_i².
export function speedFromSpectrum(measured: MatchableSpectrum, model: MachineModel, options: SpectrumSpeedOptions): SpectrumSpeed | null {
  const [loHz, hiHz] = options.searchRangeHz;
  if (!(loHz > 0 && hiHz >= loHz)) {
    throw new DiagnosisInputError('invalid_argument', `searchRangeHz [${loHz}, ${hiHz}] must be two speeds with 0 < low <= high`);
  }
  const minSnrDb = options.minSnrDb ?? 6;
  const { spectrum, snrDb } = measured;
  const df = spectrum.frequencyResolutionHz;
  const topHz = spectrum.frequenciesHz[spectrum.frequenciesHz.length - 2]!;
  // Lines below two bins sit in the window's DC skirt; lines above the last bin cannot be read.
  const lines = speedLines(model).filter((l) => l.order * loHz >= 2 * df && l.order * hiHz <= topHz);
  if (lines.length === 0) return null;
  const maxOrder = Math.max(...lines.map((l) => l.order));
  const step = Math.min(hiHz - loHz || 1, (0.25 * df) / maxOrder);
  const at = (hz: number) => {
    const x = hz / df;
    const k = Math.floor(x);
    // Linear between the two bins around the frequency: a tone lights both, most at its own position,
    // so the comb's score peaks where the lines really are rather than on a plateau one bin wide.
    const t = x - k;
    return (1 - t) * snrDb[k]! + t * snrDb[k + 1]!;
  };
  const search = (a: number, b: number): { hz: number; score: number } => {
    const n = Math.min(40_000, Math.floor((b - a) / step) + 1);
    let bestScore = -1;
    let bestHz = a;
    for (let i = 0; i < n; i++) {
      const s = n === 1 ? (a + b) / 2 : a + ((b - a) * i) / (n - 1);
      let score = 0;
      for (const l of lines) {
        const snr = at(l.order * s);
        // Clip: one very strong line must not outvote the rest, and noise below 3 dB counts nothing.
        if (snr > 3) score += Math.min(snr - 3, 20);
      }
      if (score > bestScore) {
        bestScore = score;
        bestHz = s;
      }
    }
    return { hz: bestHz, score: bestScore };
  };
  let best = search(loHz, hiHz);
  // Most machines run within a few percent of nominal: a speed far from it must be clearly better supported,
  // since across a wide range some other speed always lines a few unrelated peaks up with the comb.
  if (options.preferredHz !== undefined) {
    const a = Math.max(loHz, options.preferredHz * (1 - PREFERRED_FRACTION));
    const b = Math.min(hiHz, options.preferredHz * (1 + PREFERRED_FRACTION));
    if (b >= a) {
      const near = search(a, b);
      if (near.score > 0 && best.score < FAR_SPEED_MARGIN * near.score) best = near;
    }
  }
  const bestHz = best.hz;
  // Supporting peaks: the local maximum nearest each line within two bins of the comb position.
  const support: SpectrumSpeed['support'] = [];
  const v = spectrum.values;
  for (const l of lines) {
    const x = (l.order * bestHz) / df;
    let k = -1;
    for (let j = Math.max(1, Math.floor(x) - 1); j <= Math.min(v.length - 2, Math.ceil(x) + 1); j++) {
      if (v[j]! > v[j - 1]! && v[j]! >= v[j + 1]! && (k < 0 || Math.abs(j - x) < Math.abs(k - x))) k = j;
    }
    if (k < 0 || snrDb[k]! < minSnrDb) continue;
    // The tone the peak holds must lie within a bin of the comb position: on a coarse spectrum (a 0.1 s snapshot) the
    // nearest local maximum two bins away can be another line altogether, and would drag the speed far from the range.
    const frequencyHz = peakAt(measured, k).frequencyHz;
    if (Math.abs(frequencyHz - l.order * bestHz) > df) continue;
    support.push({ label: l.label, order: l.order, frequencyHz, snrDb: snrDb[k]! });
  }
  if (support.length === 0) return null;
  let so2 = 0;
  let sof = 0;
  for (const p of support) {
    so2 += p.order * p.order;
    sof += p.order * p.frequencyHz;
  }
  // The fit never leaves the range searched (a given speed is trusted to a few percent).
  const speedHz = Math.min(hiHz, Math.max(loHz, sof / so2));
  // Uncertainty from the residuals when there are enough lines; never below a tenth of a bin on the strongest order.
  let residual = 0;
  for (const p of support) residual += (p.frequencyHz - p.order * speedHz) ** 2;
  const fromResiduals = support.length >= 3 ? Math.sqrt(residual / (support.length - 1) / so2) : 0;
  const floorHz = (0.1 * df) / Math.sqrt(so2);
  return { speedHz, uncertaintyHz: Math.max(fromResiduals, floorHz), support, searchRangeHz: [loHz, hiHz] };
}
