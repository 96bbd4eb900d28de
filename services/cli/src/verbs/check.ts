import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

// Placeholder until its issue lands; replaced by the real verb.
export const checkVerb: Verb = {
  name: 'check',
  summary: 'check (not built yet)',
  usage: 'kinespec check',
  async run() {
    throw new CliError('this verb is not built yet');
  },
};
