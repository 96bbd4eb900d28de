/** A complex number as a plain object (amplitude-phase pairs travel through JSON unchanged). */
export interface Complex {
  re: number;
  im: number;
}

export const complex = (re: number, im = 0): Complex => ({ re, im });
export const ZERO: Complex = Object.freeze({ re: 0, im: 0 });

export const add = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });
export const sub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });
export const mul = (a: Complex, b: Complex): Complex => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
export const scale = (a: Complex, s: number): Complex => ({ re: a.re * s, im: a.im * s });
export const conj = (a: Complex): Complex => ({ re: a.re, im: -a.im });
export const abs = (a: Complex): number => Math.hypot(a.re, a.im);
export const arg = (a: Complex): number => Math.atan2(a.im, a.re);

export function div(a: Complex, b: Complex): Complex {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}

/** e^(z) for complex z. */
export function exp(z: Complex): Complex {
  const m = Math.exp(z.re);
  return { re: m * Math.cos(z.im), im: m * Math.sin(z.im) };
}

/** e^(jθ). */
export const expj = (thetaRad: number): Complex => ({ re: Math.cos(thetaRad), im: Math.sin(thetaRad) });

export const fromPolar = (amplitude: number, phaseRad: number): Complex => ({
  re: amplitude * Math.cos(phaseRad),
  im: amplitude * Math.sin(phaseRad),
});
