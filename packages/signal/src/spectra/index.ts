export {
  WINDOW_NAMES,
  WINDOW_COEFFICIENTS,
  isWindowName,
  windowSamples,
  windowCoherentGain,
  windowEnbwBins,
  coherentGainOf,
  enbwBinsOf,
  windowAmplitudeResponse,
  type WindowName,
} from './window.js';
export { DETREND_MODES, detrend, trendOf, type DetrendMode } from './detrend.js';
export {
  SPECTRUM_SCALINGS,
  AVERAGING_MODES,
  valueUnitOf,
  isUnpairedBin,
  binPower,
  valueFromPower,
  withScaling,
  type Spectrum,
  type SpectrumScaling,
  type AveragingMode,
} from './spectrum.js';
export { DEFAULT_SEGMENT_LENGTH, welchSpectrum, welchPsd, magnitudeSpectrum, type WelchOptions } from './welch.js';
export { bandRms, type BandHz } from './band-rms.js';
export {
  ISO_VELOCITY_BAND_HZ,
  overallVelocityRms,
  clipBandToNyquist,
  type OverallLevel,
  type OverallVelocity,
  type OverallVelocityOptions,
} from './overall-velocity.js';
export { DEFAULT_NOISE_FLOOR_WIDTH_BINS, runningMedian, noiseFloor } from './noise-floor.js';
export { interpolatePeak, findPeaks, type SpectralPeak, type PeakInterpolation, type PeakOptions } from './peaks.js';
export { downsampleForPlot, type PlotSeries } from './plot-downsample.js';
export {
  analyticSignal,
  fftBandPass,
  hilbertEnvelope,
  envelopeSpectrum,
  spectrumOfEnvelope,
  type AnalyticSignal,
  type EnvelopeOptions,
  type EnvelopeSpectrumOptions,
  type EnvelopeSpectrum,
} from './envelope.js';
export { complexFft, realToComplexSpectrum, inverseComplexSpectrum, largestPowerOfTwoAtMost, isPowerOfTwo, type ComplexFft } from './fft.js';
export { spectraErrorDescriptions, type SpectraErrorCode } from './spectra-error.js';
export { scratchArray, SCRATCH_LIMIT } from './scratch.js';
export { BandEnvelopes, bandPaving, type BandEnvelopeOptions, type BandPavingOptions, type DemodulationBand } from './band-envelopes.js';
