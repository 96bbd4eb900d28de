import { lineToleranceHz } from '@kinespec/diagnosis';
import type { ComponentLine } from '@kinespec/kinematics';

/*
 * Which component line of the machine a measured peak sits on: the line whose distance from the peak is the
 * smallest fraction of its matching tolerance, among the lines within tolerance. The tolerance is the one the
 * diagnosis matches with (one bin, plus three speed uncertainties times the order), widened for bearing lines
 * by their slip.
 */

// Rolling elements slip 1-2 % against their ideal kinematics (Randall & Antoni 2011, MSSP 25:485-520).
const BEARING_SLIP_FRACTION = 0.015;

export interface PeakLine {
  /** label of the nearest line within tolerance ("3× input", "BPFO input-de"), null when none */
  line: string | null;
  /** how the line's frequency was made ("18 teeth × 14.46 Hz") */
  formula?: string;
  /** other lines within tolerance of the same peak: the peak cannot tell them apart */
  alsoLines: string[];
}

export interface PeakLineOptions {
  frequencyResolutionHz: number;
  speedUncertaintyHz: number;
}

/** Names the component line under each peak frequency. */
export function linesUnderPeaks(peakFrequenciesHz: readonly number[], lines: readonly ComponentLine[], options: PeakLineOptions): PeakLine[] {
  return peakFrequenciesHz.map((f) => {
    const within = lines
      .map((line) => {
        const tolerance = lineToleranceHz(
          { frequencyHz: line.frequencyHz, order: line.order, relativeSpreadFraction: line.componentKind === 'bearing' ? BEARING_SLIP_FRACTION : 0 },
          options,
        );
        return { line, closeness: Math.abs(line.frequencyHz - f) / tolerance };
      })
      .filter((x) => x.closeness <= 1)
      .sort((a, b) => a.closeness - b.closeness);
    const best = within[0];
    if (!best) return { line: null, alsoLines: [] };
    const also = [...new Set(within.slice(1).map((x) => x.line.label))].filter((l) => l !== best.line.label);
    return { line: best.line.label, formula: best.line.formula, alsoLines: also };
  });
}

/**
 * Decimal places for a frequency read off a spectrum of this resolution: down to a tenth of a bin. An
 * interpolated peak is good to a few hundredths of a bin on a clean tone (the signal package's tests hold a
 * Hann peak to 0.05 bin in noise); digits below a tenth of a bin would claim more than the reading holds.
 */
export function frequencyDecimals(frequencyResolutionHz: number): number {
  if (!(frequencyResolutionHz > 0)) return 3;
  return Math.max(0, -Math.floor(Math.log10(frequencyResolutionHz / 10)));
}
