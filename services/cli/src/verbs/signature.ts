import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

// Placeholder until its issue lands; replaced by the real verb.
export const signatureVerb: Verb = {
  name: 'signature',
  summary: 'signature (not built yet)',
  usage: 'kinespec signature',
  async run() {
    throw new CliError('this verb is not built yet');
  },
};
