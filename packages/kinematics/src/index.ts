// Public surface of @kinespec/kinematics: the machine model (schema, loader, validator), shaft speeds and
// the component frequency catalogue. Other packages import only from here.
export * from './machine-model.js';
export * from './problem.js';
export * from './validator.js';
export * from './loader.js';
export * from './shaft-speeds.js';
