import { parseArgs } from 'node:util';
import { CliError } from '../cli-error.js';
import type { Verb } from '../verb.js';

const USAGE =
  'kinespec serve [--port 8080] [--host 127.0.0.1]\n\n' +
  'Runs the HTTP service and the web console. Without DATABASE_URL it keeps its data in an embedded\n' +
  'database in ./data (KINESPEC_DATA_DIR) and, on the first start, seeds a demo site. Flags win over\n' +
  'KINESPEC_PORT and KINESPEC_HOST; README.md lists every environment variable.';

function portOf(text: string): number {
  const port = Number(text);
  if (!Number.isInteger(port) || port < 0 || port > 65535) throw new CliError(`--port (${text}) must be a whole number from 0 to 65535`);
  return port;
}

export const serveVerb: Verb = {
  name: 'serve',
  summary: 'run the HTTP service (API, docs, web console); what `npm start` runs',
  usage: USAGE,
  async run(args, io) {
    let values: { port?: string; host?: string };
    try {
      ({ values } = parseArgs({ args, options: { port: { type: 'string' }, host: { type: 'string' } }, strict: true, allowPositionals: false }));
    } catch (err) {
      throw new CliError(err instanceof Error ? err.message : String(err));
    }
    // the service and its database driver load only when this verb runs
    const { ConfigError, loadConfig, startService } = await import('@kinespec/api');
    let config;
    try {
      config = loadConfig(process.env, {
        ...(values.port !== undefined ? { port: portOf(values.port) } : {}),
        ...(values.host !== undefined ? { host: values.host } : {}),
      });
    } catch (err) {
      if (err instanceof ConfigError) throw new CliError(err.message);
      throw err;
    }
    const service = await startService(config, { out: (text) => io.out(text) });
    return new Promise<number>((resolve) => {
      let stopping = false;
      const stop = (signal: string) => {
        if (stopping) return;
        stopping = true;
        io.err(`kinespec: ${signal} received, finishing in-flight requests...`);
        const timer = setTimeout(() => {
          io.err(`kinespec: still busy after ${config.shutdownTimeoutMs} ms (KINESPEC_SHUTDOWN_TIMEOUT_MS); exiting anyway`);
          process.exit(1);
        }, config.shutdownTimeoutMs);
        timer.unref();
        service.close().then(
          () => { clearTimeout(timer); io.err('kinespec: stopped'); resolve(0); },
          (err: unknown) => { clearTimeout(timer); io.err(`kinespec: error while stopping: ${String(err)}`); resolve(1); },
        );
      };
      process.once('SIGINT', () => stop('SIGINT'));
      process.once('SIGTERM', () => stop('SIGTERM'));
    });
  },
};
