// Converts a spectrum between acceleration and velocity, bin by bin.
// Harmonic motion: v = a / (2πf), a = 2πf·v (common practice). Standard gravity 9.80665 m/s²
// (CGPM 1901, ISO 80000-3). A power spectral density scales with the square of the factor.

export type Quantity = 'acceleration' | 'velocity';
export type Scaling = 'peak' | 'rms' | 'psd';

const standardGravityMPerS2 = 9.80665;

/** Metres per second squared for one unit of an acceleration unit name, or null when unknown. */
export function accelerationUnitInMPerS2(unit: string): number | null {
  const u = unit.trim().toLowerCase().replace('²', '^2').replace(/\s+/g, '');
  if (u === 'g') return standardGravityMPerS2;
  if (u === 'm/s^2' || u === 'm/s2' || u === 'ms^-2') return 1;
  if (u === 'mm/s^2' || u === 'mm/s2') return 1e-3;
  return null;
}

/** Metres per second for one unit of a velocity unit name, or null when unknown. */
export function velocityUnitInMPerS(unit: string): number | null {
  const u = unit.trim().toLowerCase().replace(/\s+/g, '');
  if (u === 'mm/s') return 1e-3;
  if (u === 'm/s') return 1;
  if (u === 'in/s' || u === 'ips') return 0.0254;
  return null;
}

export interface ConvertedSpectrum {
  values: number[];
  unit: string;
  quantity: Quantity;
}

function psdUnit(base: string, scaling: Scaling): string {
  return scaling === 'psd' ? `(${base})²/Hz` : base;
}

/** The base unit of a spectrum's unit string: "g" from "g²/Hz", "mm/s" from "(mm/s)^2/Hz"; "m/s^2" stays. */
export function baseUnit(unit: string): string {
  const text = unit.trim();
  const density = /^(.*?)\s*\/\s*hz$/i.exec(text);
  if (!density) return text;
  const squared = density[1]!.trim();
  const bracketed = /^\((.*)\)\s*(\^2|²)$/.exec(squared);
  if (bracketed) return bracketed[1]!.trim();
  return squared.replace(/(\^2|²)$/, '');
}

/**
 * @returns the spectrum in the target quantity (velocity in mm/s, acceleration in the source's
 *   unit when it was acceleration, else m/s²); the DC bin of a velocity spectrum is set to 0.
 */
export function convertSpectrum(
  frequenciesHz: readonly number[],
  values: readonly number[],
  from: { quantity: Quantity; unit: string; scaling: Scaling },
  to: Quantity,
): ConvertedSpectrum {
  const unit = baseUnit(from.unit);
  if (from.quantity === to) return { values: [...values], unit: from.unit, quantity: to };
  const power = from.scaling === 'psd' ? 2 : 1;
  if (from.quantity === 'acceleration') {
    const perUnit = accelerationUnitInMPerS2(unit);
    if (perUnit === null) throw new RangeError(`unit (${from.unit}) is not an acceleration unit the console can convert`);
    // a [unit] → v [mm/s]: a·perUnit / (2πf) m/s, × 1000 for mm/s
    const out = values.map((v, i) => {
      const f = frequenciesHz[i]!;
      return f > 0 ? v * ((perUnit * 1000) / (2 * Math.PI * f)) ** power : 0;
    });
    return { values: out, unit: psdUnit('mm/s', from.scaling), quantity: 'velocity' };
  }
  const perUnit = velocityUnitInMPerS(unit);
  if (perUnit === null) throw new RangeError(`unit (${from.unit}) is not a velocity unit the console can convert`);
  const out = values.map((v, i) => v * (perUnit * 2 * Math.PI * frequenciesHz[i]!) ** power);
  return { values: out, unit: psdUnit('m/s²', from.scaling), quantity: 'acceleration' };
}
