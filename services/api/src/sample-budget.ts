import { problem, ProblemError } from './problems.js';

/*
 * Admission of recordings into analysis by their size. Memory is what a few large uploads exhaust: a decoded
 * recording is 8 bytes a sample as float64 and the analysis holds a few times that, so the service admits at
 * most `maxSamples` samples at once (decoded, analysing or storing) and answers 503 with Retry-After beyond
 * it, instead of letting a handful of 32 MB uploads take the process past its memory. A recording larger than
 * the whole budget can never be admitted: 413.
 */

/** Seconds a client is told to wait when the budget is spent: about one long analysis. */
export const BUDGET_RETRY_AFTER_S = 10;

export class SampleBudget {
  private inFlight = 0;

  constructor(readonly maxSamples: number) {}

  get samplesInFlight(): number {
    return this.inFlight;
  }

  /** Takes `samples` from the budget; the returned function gives them back (call it once, in a finally). */
  admit(samples: number): () => void {
    if (samples > this.maxSamples) {
      throw new ProblemError('recording-too-large', `the recording holds ${samples} samples; the service analyses at most ${this.maxSamples} at once (KINESPEC_MAX_ANALYSIS_SAMPLES)`, { code: 'too_large' });
    }
    if (this.inFlight + samples > this.maxSamples) {
      throw problem('service-unavailable', `the service is analysing ${this.inFlight} samples already; retry after the time given`, {
        headers: { 'retry-after': String(BUDGET_RETRY_AFTER_S) },
      });
    }
    this.inFlight += samples;
    let released = false;
    return () => {
      if (released) return;
      released = true;
      this.inFlight -= samples;
    };
  }
}
