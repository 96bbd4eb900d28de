export {
  STANDARD_GRAVITY_M_PER_S2,
  MOTION_UNITS,
  PREFERRED_UNIT,
  canonicalUnit,
  isMotionUnit,
  normalizeUnit,
  quantityOfUnit,
  siUnitOf,
  unitScaleFactor,
  convertUnit,
  type Quantity,
  type MotionUnit,
} from './unit-registry.js';
export {
  DEFAULT_INTEGRATION_CUTOFF_HZ,
  integrateSignal,
  integrateSpectrum,
  type IntegrationOptions,
} from './frequency-integration.js';
export { unitErrorDescriptions, type UnitErrorCode } from './unit-error.js';
export {
  SIGNAL_UNITS,
  UNSTATED_UNIT,
  ACCEPTED_UNITS,
  acceptedUnitsText,
  canonicalChannelUnit,
  checkChannelUnit,
  type SignalUnit,
} from './channel-units.js';
export { editDistance, nearestName } from './nearest-name.js';
