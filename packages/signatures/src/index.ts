// Public surface of @kinespec/signatures: Fourier series of fault excitations, the machine's response
// (SDOF, torsional chain) and predicted fault signatures. Other packages import only from here.
export type { Complex } from './complex.js';
export * from './errors.js';
export * from './fourier-series.js';
export * from './sdof.js';
export * from './shaft-stiffness.js';
export * from './torsional-chain.js';
export * from './excitation.js';
export * from './line-modulation.js';
export * from './gear-tooth-excitation.js';
export * from './bearing-excitation.js';
export * from './shaft-excitation.js';
export * from './electrical-excitation.js';
export * from './torsional-model.js';
export * from './measured-quantity.js';
export * from './fault-kinds.js';
export * from './fault-candidates.js';
export * from './signature.js';
export * from './campbell.js';
