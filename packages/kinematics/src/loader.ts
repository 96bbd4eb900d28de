import { parseDocument, YAMLError } from 'yaml';
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
    value = asJson ? JSON.parse(text) : parseYamlStrict(text);
  } catch (err) {
    return { ok: false, problems: [{ path: '', code: 'parse_error', message: syntaxMessage(err, asJson ? 'JSON' : 'YAML', text) }] };
  }
  return validateMachineModel(value);
}

/** YAML with its warnings (unknown tags and the like) treated as errors; the yaml package would only log them. */
function parseYamlStrict(text: string): unknown {
  const doc = parseDocument(text, { prettyErrors: true, uniqueKeys: true, logLevel: 'silent' });
  const first: YAMLError | undefined = doc.errors[0] ?? doc.warnings[0];
  if (first) throw first;
  return doc.toJS({ maxAliasCount: 100 });
}

function syntaxMessage(err: unknown, kind: 'JSON' | 'YAML', text: string): string {
  if (err instanceof YAMLError) {
    const at = err.linePos?.[0];
    const firstLine = (err.message.split('\n')[0] ?? '').replace(/:\s*$/, '').replace(/ at line \d+, column \d+$/, '');
    return `not valid YAML${at ? ` (line ${at.line}, column ${at.col})` : ''}: ${firstLine}`;
  }
  const message = (err instanceof Error ? err.message : String(err)).split('\n')[0] ?? '';
  // V8 names a character offset; people look for a line and a column.
  const position = /at position (\d+)/.exec(message);
  if (position) {
    const before = text.slice(0, Number(position[1]));
    const line = before.split('\n').length;
    const col = before.length - before.lastIndexOf('\n');
    return `not valid ${kind} (line ${line}, column ${col}): ${message.replace(/ in JSON at position \d+.*$/, '')}`;
  }
  return `not valid ${kind}: ${message}`;
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
