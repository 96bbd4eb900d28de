import type { MachineModel } from '@kinespec/kinematics';
import {
  campbellData,
  faultCandidates,
  faultExcitation,
  partialSumWaveform,
  predictSignature,
  sampleSegments,
  segmentsOrigin,
  type FaultKind,
} from '@kinespec/signatures';

/*
 * What the signature explorer draws, put together from @kinespec/signatures: the predicted lines, the
 * excitation over one period of its fundamental with partial sums of its Fourier series, the
 * magnification of each line by the machine's response, and the Campbell data. Composition only; every
 * number comes from the package.
 */

/** Points over one period of the excitation for the waveform plots. */
export const WAVEFORM_POINTS = 512;
/** Partial sums offered for the convergence plot (those the series has). */
const PARTIAL_SUM_HARMONICS = [1, 2, 3, 5, 10, 20, 50, 100];

export interface SignatureRequest {
  fault: string;
  component: string;
  speedRpm?: number;
  point?: string;
  harmonics?: number;
}

export function signatureView(model: MachineModel, request: SignatureRequest): Record<string, unknown> {
  const signature = predictSignature(model, {
    fault: request.fault as FaultKind,
    component: request.component,
    ...(request.speedRpm !== undefined ? { speedRpm: request.speedRpm } : {}),
    ...(request.point !== undefined ? { point: request.point } : {}),
    ...(request.harmonics !== undefined ? { harmonics: request.harmonics } : {}),
  });
  const { segments, ...excitationInfo } = signature.excitation;
  let angleRev: number[] = [];
  let waveform: number[] = [];
  if (segments && segments.length > 0) {
    const origin = segmentsOrigin(segments);
    waveform = Array.from(sampleSegments(segments, WAVEFORM_POINTS));
    angleRev = waveform.map((_, i) => origin + i / WAVEFORM_POINTS);
  }
  const partialSums: Record<string, number[]> = {};
  // the Fourier series of the same periodic waveform, for the partial sums
  const series = faultExcitation(model, {
    fault: request.fault as FaultKind,
    component: request.component,
    ...(request.speedRpm !== undefined ? { speedRpm: request.speedRpm } : {}),
    ...(request.harmonics !== undefined ? { harmonics: request.harmonics } : {}),
  }).series;
  if (series && series.terms.length > 0) {
    const start = angleRev[0] ?? 0;
    const counts = new Set([...PARTIAL_SUM_HARMONICS.filter((n) => n <= series.terms.length), series.terms.length]);
    for (const n of [...counts].sort((a, b) => a - b)) {
      const w = partialSumWaveform(series, { harmonics: n, points: WAVEFORM_POINTS, startFraction: start });
      partialSums[String(n)] = Array.from(w.value);
      if (angleRev.length === 0) angleRev = Array.from(w.angleFraction);
    }
  }
  const magnification = signature.lines.map((l) => ({
    harmonic: l.harmonic,
    sideband: l.sideband,
    frequencyHz: l.frequencyHz,
    factor: l.magnification,
    torsional: l.torsionalMagnification,
    structural: l.structuralMagnification,
    label: l.label,
  }));
  const orders = [...new Map(signature.lines.filter((l) => l.order > 0).map((l) => [l.order, { order: l.order, label: l.label }])).values()].slice(0, 12);
  const campbell = campbellData(model, orders.length > 0 ? { orders } : {});
  return {
    ...signature,
    excitation: { ...excitationInfo, angleRev, waveform, partialSums },
    magnification,
    campbell,
  };
}

export function faultList(model: MachineModel): Array<{ fault: string; component: string; componentKind: string; shaft: string }> {
  return faultCandidates(model);
}
