import { parse as parseYaml, YAMLParseError } from 'yaml';
import type { MachineModel } from './machine-model.js';
import { MachineModelError } from './problem.js';
import { validateMachineModel, type ValidationResult } from './validator.js';

export type MachineModelFormat = 'json' | 'yaml';

/**
 * Parses the text of a machine model file and validates it. JSON when `format` says so or the text
 * starts with '{'; YAML (same fields) otherwise. Never throws: syntax errors are problems too.
 */
export function parseMachineModel(text: string, format?: MachineModelFormat): ValidationResult {
  if (typeof text !== 'string') {
    return { ok: false, problems: [{ path: '', code: 'parse_error', message: 'the machine model must be given as text' }] };
  }
  const asJson = format === 'json' || (format === undefined && text.trimStart().startsWith('{'));
  let value: unknown;
  try {
    value = asJson ? JSON.parse(text) : parseYaml(text, { prettyErrors: true, uniqueKeys: true, maxAliasCount: 100 });
  } catch (err) {
    return { ok: false, problems: [{ path: '', code: 'parse_error', message: syntaxMessage(err, asJson ? 'JSON' : 'YAML') }] };
  }
  return validateMachineModel(value);
}

function syntaxMessage(err: unknown, kind: 'JSON' | 'YAML'): string {
  if (err instanceof YAMLParseError) {
    const at = err.linePos?.[0];
    const firstLine = (err.message.split('\n')[0] ?? '').replace(/:\s*$/, '');
    return `not valid YAML${at ? ` (line ${at.line}, column ${at.col})` : ''}: ${firstLine}`;
  }
  const message = err instanceof Error ? err.message : String(err);
  return `not valid ${kind}: ${message.split('\n')[0]}`;
}

/** Like parseMachineModel, for callers that prefer an exception: throws MachineModelError with every problem. */
export function loadMachineModel(text: string, format?: MachineModelFormat): MachineModel {
  const result = parseMachineModel(text, format);
  if (!result.ok) throw new MachineModelError(result.problems);
  return result.model;
}

/** Like validateMachineModel, throwing MachineModelError with every problem. */
export function assertMachineModel(input: unknown): MachineModel {
  const result = validateMachineModel(input);
  if (!result.ok) throw new MachineModelError(result.problems);
  return result.model;
}
