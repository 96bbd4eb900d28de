// Public surface of @kinespec/lumped-rig: an independent source of labelled vibration recordings (lumped gear
// dynamics, cyclostationary bearing impacts, shaft faults) on machines of its own. It imports no other package.
export { generateCorpus, corpusCases, corpusPlan, synthesizeCase, faultOptions, type CorpusCase, type CorpusCasePlan, type CorpusLabel, type CorpusOptions } from './corpus.js';
export { synthesizeRecording, STANDARD_GRAVITY, type RigRecording, type SynthesisPlan, type SynthesisResult } from './recording-synthesis.js';
export { rigMachines, rigMachine } from './rig-machines.js';
export type { RigMachine } from './rig-machine.js';
export type { MachineModelDocument } from './machine-model-document.js';
export { rigFaultKinds, FAULT_SIZE_RANGES, type RigFault, type RigFaultKind, type RigSeverity, type FaultSize } from './rig-faults.js';
export { defectFrequenciesHz, type DefectFrequencies, type RollingBearingGeometry } from './bearing-kinematics.js';
export { bearingImpacts, type BearingImpactSpec } from './bearing-impacts.js';
export { gearStageGeometry, type GearStageSpec, type GearStageGeometry } from './gear-geometry.js';
export { simulateGearTrain, naturalFrequenciesHz, type GearTrainSpec } from './gear-train.js';
export { createRandom, type Random } from './random.js';
