import type { ComponentLine } from './component-lines.js';

export interface RecordingLimits {
  sampleRateHz: number;
  /** Spacing of the spectrum's bins (or its effective resolution bandwidth). */
  frequencyResolutionHz: number;
}

export interface FlaggedLine extends ComponentLine {
  /** At or above half the sample rate: not in the recording (or aliased). */
  aboveNyquist: boolean;
  /** Closer than the resolution to a line of another component: the spectrum cannot tell them apart. */
  ambiguous: boolean;
  /** Labels of the lines of other components within the resolution. */
  ambiguousWith: string[];
}

/**
 * Marks the lines a given recording cannot show (above Nyquist) or cannot separate (within one
 * resolution step of a line that belongs to a different component). Keeps the order of `lines`.
 */
export function flagLines(lines: readonly ComponentLine[], limits: RecordingLimits): FlaggedLine[] {
  const { sampleRateHz, frequencyResolutionHz } = limits;
  if (!(sampleRateHz > 0) || !Number.isFinite(sampleRateHz)) throw new RangeError(`sampleRateHz (${sampleRateHz}) must be a finite number > 0`);
  if (!(frequencyResolutionHz > 0) || !Number.isFinite(frequencyResolutionHz)) {
    throw new RangeError(`frequencyResolutionHz (${frequencyResolutionHz}) must be a finite number > 0`);
  }
  const nyquistHz = sampleRateHz / 2;
  const order = lines.map((_, i) => i).sort((a, b) => lines[a]!.frequencyHz - lines[b]!.frequencyHz);
  const near: string[][] = lines.map(() => []);
  // Sweep in frequency order: each line only needs the lines after it within the resolution.
  for (let a = 0; a < order.length; a++) {
    const i = order[a]!;
    for (let b = a + 1; b < order.length; b++) {
      const j = order[b]!;
      if (lines[j]!.frequencyHz - lines[i]!.frequencyHz >= frequencyResolutionHz) break;
      if (lines[j]!.component === lines[i]!.component) continue;
      near[i]!.push(lines[j]!.label);
      near[j]!.push(lines[i]!.label);
    }
  }
  return lines.map((line, i) => ({
    ...line,
    aboveNyquist: line.frequencyHz >= nyquistHz,
    ambiguous: near[i]!.length > 0,
    ambiguousWith: near[i]!,
  }));
}
