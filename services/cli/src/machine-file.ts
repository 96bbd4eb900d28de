import { extname } from 'node:path';
import { formatProblem, parseMachineModel, type MachineModel, type MachineModelFormat, type ValidationResult } from '@kinespec/kinematics';
import { CliError } from './cli-error.js';
import { readInputFile } from './input-file.js';
import type { CliIo } from './io.js';

/** JSON for .json, YAML for .yaml/.yml, otherwise guessed from the text. */
export function machineFileFormat(path: string): MachineModelFormat | undefined {
  const ext = extname(path).toLowerCase();
  if (ext === '.json') return 'json';
  if (ext === '.yaml' || ext === '.yml') return 'yaml';
  return undefined;
}

/** The one machine model file of a verb's positionals. */
export function machineFileArgument(positionals: readonly string[], usage: string): string {
  const [path, ...extra] = positionals;
  if (path === undefined) throw new CliError(`missing the machine model file (usage: ${usage})`);
  if (extra.length > 0) throw new CliError(`unexpected argument '${extra[0]}'`);
  return path;
}

/** Reads and validates a machine model file; a file that cannot be read is a CliError. */
export function readMachineFile(path: string): ValidationResult {
  return parseMachineModel(readInputFile(path, 'machine model').toString('utf8'), machineFileFormat(path));
}

/** One line per problem: "gearMeshes[1].driven.teeth: must be a whole number >= 1 (out_of_range)". */
export function problemLines(result: Extract<ValidationResult, { ok: false }>): string[] {
  return result.problems.map((p) => `${formatProblem(p)} (${p.code})`);
}

/**
 * For verbs that need a valid model: prints every problem to stderr and throws a one-line CliError
 * (exit 2) when the file is not a valid machine model.
 */
export function loadMachineFile(path: string, io: CliIo): MachineModel {
  const result = readMachineFile(path);
  if (!result.ok) {
    for (const line of problemLines(result)) io.err(`${path}: ${line}`);
    const n = result.problems.length;
    throw new CliError(`${path} is not a valid machine model (${n} problem${n === 1 ? '' : 's'}; run 'kinespec check ${path}')`);
  }
  return result.model;
}
