import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

// Placeholder until its issue lands; replaced by the real verb.
export const uploadVerb: Verb = {
  name: 'upload',
  summary: 'upload (not built yet)',
  usage: 'kinespec upload',
  async run() {
    throw new CliError('this verb is not built yet');
  },
};
