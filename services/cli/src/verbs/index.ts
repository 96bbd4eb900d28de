import type { Verb } from '../verb.js';

/**
 * Every verb, loaded lazily so that `kinespec --version` and light verbs do not pay for
 * heavy imports (fastify, the database driver). One line per verb; each verb lives in its own file.
 */
export const verbLoaders: Record<string, () => Promise<Verb>> = {
  spectrum: async () => (await import('./spectrum.js')).spectrumVerb,
  frequencies: async () => (await import('./frequencies.js')).frequenciesVerb,
  check: async () => (await import('./check.js')).checkVerb,
  signature: async () => (await import('./signature.js')).signatureVerb,
  diagnose: async () => (await import('./diagnose.js')).diagnoseVerb,
  orders: async () => (await import('./orders.js')).ordersVerb,
  serve: async () => (await import('./serve.js')).serveVerb,
  upload: async () => (await import('./upload.js')).uploadVerb,
  trend: async () => (await import('./trend.js')).trendVerb,
  worker: async () => (await import('./worker.js')).workerVerb,
};
