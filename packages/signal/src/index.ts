// Public surface of @kinespec/signal. Each area keeps its own index; other packages import only from here.
export type { Channel, Recording } from './recording.js';
export { SignalInputError } from './errors.js';
export * from './decode/index.js';
export * from './units/index.js';
export * from './spectra/index.js';
export * from './angle/index.js';
