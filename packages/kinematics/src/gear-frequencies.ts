/** Greatest common divisor of two whole numbers (Euclid). */
export function greatestCommonDivisor(a: number, b: number): number {
  let x = Math.abs(a);
  let y = Math.abs(b);
  while (y !== 0) [x, y] = [y, x % y];
  return x;
}

// Common practice: GMF = N_p·f_p = N_g·f_g (each tooth of a gear passes the mesh once per turn).
export function gearMeshFrequencyHz(teeth: number, shaftSpeedHz: number): number {
  return teeth * shaftSpeedHz;
}

/**
 * Number of assembly phases N_A of a gear pair: the tooth pairs fall into N_A classes that never meet
 * each other; N_A = 1 is a "hunting tooth" set.
 */
// W. C. Foiles, "Gear Frequencies Using the Euclidean Algorithm", Vibration Institute: N_A = GCD(N_p, N_g).
export function assemblyPhaseCount(pinionTeeth: number, gearTeeth: number): number {
  return greatestCommonDivisor(pinionTeeth, gearTeeth);
}

/**
 * Hunting-tooth (tooth-repeat) frequency: how often one given pinion tooth meets one given gear tooth again.
 * Not GCD × shaft speed, as some public calculators have it.
 */
// J. I. Taylor, The Gear Analysis Handbook (2000); Foiles: f_HT = GMF·N_A/(N_p·N_g) = GMF / LCM(N_p, N_g).
export function huntingToothFrequencyHz(meshFrequencyHz: number, pinionTeeth: number, gearTeeth: number): number {
  return (meshFrequencyHz * assemblyPhaseCount(pinionTeeth, gearTeeth)) / (pinionTeeth * gearTeeth);
}

// Foiles (Vibration Institute); common practice: f_AP = GMF / N_A, the rate at which one assembly phase repeats.
export function assemblyPhaseFrequencyHz(meshFrequencyHz: number, pinionTeeth: number, gearTeeth: number): number {
  return meshFrequencyHz / assemblyPhaseCount(pinionTeeth, gearTeeth);
}
