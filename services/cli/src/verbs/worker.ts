import { parseArgs } from 'node:util';
import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

const USAGE =
  'kinespec worker\n\n' +
  'Analyses recordings from the PostgreSQL job queue (DATABASE_URL) and serves no HTTP: run any number beside\n' +
  'the `kinespec serve` replicas, here or on other machines. KINESPEC_QUEUE_WORKERS jobs at once on\n' +
  'KINESPEC_ANALYSIS_THREADS threads; SIGINT or SIGTERM finishes the jobs in hand, then stops.';

export const workerVerb: Verb = {
  name: 'worker',
  summary: 'analyse queued recordings from a PostgreSQL server (no HTTP); for scale-out beside `serve`',
  usage: USAGE,
  async run(args, io) {
    try {
      parseArgs({ args, options: {}, strict: true, allowPositionals: false });
    } catch (err) {
      throw new CliError(err instanceof Error ? err.message : String(err));
    }
    const { ConfigError, loadConfig, startWorker } = await import('@kinespec/api');
    let worker;
    try {
      const config = loadConfig(process.env);
      worker = await startWorker(config, { out: (text) => io.out(text) });
    } catch (err) {
      if (err instanceof ConfigError) throw new CliError(err.message);
      throw err;
    }
    return new Promise<number>((resolve) => {
      const stop = (signal: string) => {
        io.err(`kinespec worker: ${signal} received, finishing the jobs in hand...`);
        worker.close().then(() => resolve(0), (err: unknown) => {
          io.err(`kinespec worker: error while stopping: ${String(err)}`);
          resolve(1);
        });
      };
      process.once('SIGINT', () => stop('SIGINT'));
      process.once('SIGTERM', () => stop('SIGTERM'));
    });
  },
};
