import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

// Placeholder until its issue lands; replaced by the real verb.
export const ordersVerb: Verb = {
  name: 'orders',
  summary: 'orders (not built yet)',
  usage: 'kinespec orders',
  async run() {
    throw new CliError('this verb is not built yet');
  },
};
