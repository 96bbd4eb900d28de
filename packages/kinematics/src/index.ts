// Public surface of @kinespec/kinematics: the machine model (schema, loader, validator), shaft speeds and
// the component frequency catalogue. Other packages import only from here.
export * from './machine-model.js';
export * from './problem.js';
export * from './validator.js';
export * from './loader.js';
export * from './shaft-speeds.js';
export * from './bearing-frequencies.js';
export * from './gear-frequencies.js';
export * from './belt-frequencies.js';
export * from './motor-frequencies.js';
export * from './component-lines.js';
export * from './line-flags.js';
export * from './torsional-couplings.js';
export * from './fault-kinds.js';
