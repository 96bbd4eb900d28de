import { readFileSync } from 'node:fs';
import { CliError } from './cli-error.js';

/** Why a file could not be read, in words where the reason is a common one, else the system's code. */
function readFailure(err: unknown): string {
  const code = (err as NodeJS.ErrnoException).code;
  if (code === 'ENOENT') return 'no such file';
  if (code === 'EISDIR') return 'it is a directory';
  if (code === 'EACCES') return 'permission denied';
  return String(code ?? err);
}

/**
 * The bytes of a file named on the command line. A file that cannot be read is a one-line CliError:
 * "cannot read 'p2.wav': no such file", or with `what`, "cannot read machine model 'm.json': it is a directory".
 */
export function readInputFile(path: string, what?: string): Buffer {
  try {
    return readFileSync(path);
  } catch (err) {
    throw new CliError(`cannot read ${what === undefined ? '' : `${what} `}'${path}': ${readFailure(err)}`);
  }
}
