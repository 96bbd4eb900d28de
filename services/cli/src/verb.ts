import type { CliIo } from './io.js';

/** One CLI verb. `run` returns the process exit code. */
export interface Verb {
  name: string;
  summary: string;
  usage: string;
  run(args: string[], io: CliIo): Promise<number>;
}
