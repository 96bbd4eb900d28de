import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

// Placeholder until its issue lands; replaced by the real verb.
export const diagnoseVerb: Verb = {
  name: 'diagnose',
  summary: 'diagnose (not built yet)',
  usage: 'kinespec diagnose',
  async run() {
    throw new CliError('this verb is not built yet');
  },
};
