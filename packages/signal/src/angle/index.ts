// Angle domain of @kinespec/signal: pulse trains (tach, encoder), shaft angle and speed, computed order
// tracking, order spectra, time-synchronous averages and gear indicators, torsional vibration, run-ups.
export { detectPulses, pulsesFromCounts, type PulseDetectionOptions, type DetectedPulses } from './pulse-detection.js';
export { speedFromPulses, type PulseSpeedOptions, type PulseSpeed } from './pulse-speed.js';
export { shaftAngleFromPulses, shaftAngleFromLaw, scaleShaftAngle, type ShaftAngle } from './shaft-angle.js';
export { cubicSpline, evaluateSpline, type CubicSpline } from './cubic-spline.js';
export {
  resampleToAngle,
  type AngleInterpolation,
  type AngleResamplingOptions,
  type AngleDomainSignal,
} from './angle-resampling.js';
export { orderSpectrum, valueAtOrder, type OrderSpectrum, type OrderSpectrumOptions } from './order-spectrum.js';
export { timeSynchronousAverage, shaftSynchronousAverage, type SynchronousAverage } from './synchronous-average.js';
export { gearIndicators, type GearIndicators, type GearIndicatorOptions } from './gear-indicators.js';
export { torsionalVibration, type TorsionalVibration, type TorsionalVibrationOptions } from './torsional-vibration.js';
export { runUpMap, type RunUpMap, type RunUpOptions } from './run-up.js';
