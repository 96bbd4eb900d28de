// Public surface of @kinespec/signatures: Fourier series of fault excitations, the machine's response
// (SDOF, torsional chain) and predicted fault signatures. Other packages import only from here.
export * from './complex.js';
export * from './errors.js';
export * from './fourier-series.js';
export * from './sdof.js';
export * from './shaft-stiffness.js';
export * from './torsional-chain.js';
