import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

// Placeholder until its issue lands; replaced by the real verb.
export const spectrumVerb: Verb = {
  name: 'spectrum',
  summary: 'spectrum (not built yet)',
  usage: 'kinespec spectrum',
  async run() {
    throw new CliError('this verb is not built yet');
  },
};
