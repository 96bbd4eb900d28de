import fc from 'fast-check';

// Property tests run from a fixed seed so that a CI run is reproducible; set FC_SEED to another
// number (or to 'random') to explore further locally. A failure prints its seed and path either way.
const seed = process.env.FC_SEED;
if (seed !== 'random') fc.configureGlobal({ seed: seed === undefined ? 20261201 : Number(seed) });
