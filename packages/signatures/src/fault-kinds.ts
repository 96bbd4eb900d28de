// The fault kinds are the machine-model contract's vocabulary and live in @kinespec/kinematics, where the
// simulator takes them too; re-exported so that callers of predictSignature find them beside it.
export { faultComponentKinds, faultKinds, isFaultKind, type FaultComponentKind, type FaultKind } from '@kinespec/kinematics';
