import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

// Placeholder until its issue lands; replaced by the real verb.
export const serveVerb: Verb = {
  name: 'serve',
  summary: 'serve (not built yet)',
  usage: 'kinespec serve',
  async run() {
    throw new CliError('this verb is not built yet');
  },
};
