import { readFileSync } from 'node:fs';
import { CliError } from './cli-error.js';
import { processIo, type CliIo } from './io.js';
import { verbLoaders } from './verbs/index.js';

function version(): string {
  const pkg = JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8')) as { version: string };
  return pkg.version;
}

/** The first clause of a verb's summary, for the list of verbs. */
export function brief(summary: string): string {
  const clause = summary.split('\n')[0]!.split(/[:;]\s/)[0]!.replace(/\.$/, '');
  const first = clause.charAt(0).toUpperCase() + clause.slice(1);
  return first.length > 90 ? `${first.slice(0, 89)}…` : first;
}

async function help(): Promise<string> {
  const names = Object.keys(verbLoaders).sort();
  const width = Math.max(...names.map((n) => n.length));
  const verbs = await Promise.all(names.map(async (n) => `  ${n.padEnd(width)}  ${brief((await verbLoaders[n]!()).summary)}`));
  return `kinespec ${version()}: condition monitoring for rotating machinery\n\nUsage: kinespec <verb> [options]\n\nVerbs:\n${verbs.join('\n')}\n\nRun 'kinespec <verb> --help' for a verb's options.`;
}

/** Runs the CLI and returns the exit code; every expected failure becomes one line on stderr. */
export async function main(argv: string[], io: CliIo = processIo): Promise<number> {
  const [verbName, ...rest] = argv;
  if (verbName === undefined || verbName === '--help' || verbName === '-h' || verbName === 'help') {
    io.out(await help());
    return 0;
  }
  if (verbName === '--version' || verbName === '-v') {
    io.out(version());
    return 0;
  }
  const load = verbLoaders[verbName];
  if (!load) {
    io.err(`kinespec: unknown verb '${verbName}' (try 'kinespec --help')`);
    return 2;
  }
  try {
    const verb = await load();
    if (rest.includes('--help') || rest.includes('-h')) {
      io.out(`${verb.summary}\n\nUsage: ${verb.usage}`);
      return 0;
    }
    return await verb.run(rest, io);
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    io.err(`kinespec ${verbName}: ${message.split('\n')[0]}`);
    return err instanceof CliError ? err.exitCode : 2;
  }
}
