import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

// Placeholder until its issue lands; replaced by the real verb.
export const frequenciesVerb: Verb = {
  name: 'frequencies',
  summary: 'frequencies (not built yet)',
  usage: 'kinespec frequencies',
  async run() {
    throw new CliError('this verb is not built yet');
  },
};
