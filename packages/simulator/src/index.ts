// Public surface of @kinespec/simulator: synthetic recordings of a machine model's points from
// time-domain physics, independent of @kinespec/signatures, for evaluation, tests and the demo.
export { simulateRecording, faultKinds } from './simulate-recording.js';
export type { FaultKind, SimulatedFault, SimulationOptions } from './simulate-recording.js';
export { SimulatorInputError } from './errors.js';
export { mulberry32, gaussian } from './prng.js';
export type { Uniform } from './prng.js';
export type { SpeedProfile } from './speed-profile.js';
export { colouredNoise, COLOURED_NOISE_CORNER_HZ, type NoiseColour } from './coloured-noise.js';
