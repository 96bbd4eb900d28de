import { parseArgs, type ParseArgsConfig } from 'node:util';
import { CliError } from './cli-error.js';

type FlagOptions = NonNullable<ParseArgsConfig['options']>;
type ParsedFlags<O extends FlagOptions> = ReturnType<typeof parseArgs<{ args: string[]; options: O; allowPositionals: true; strict: true }>>;

/**
 * node:util parseArgs with positionals allowed and unknown options refused; a parse failure is a one-line
 * CliError ending in the verb's usage, e.g. "Unknown option '--colour'. ... (usage: kinespec spectrum <file> ...)".
 */
export function parseFlags<const O extends FlagOptions>(args: string[], options: O, usage: string): ParsedFlags<O> {
  try {
    return parseArgs({ args, options, allowPositionals: true, strict: true });
  } catch (err) {
    throw new CliError(`${renamedFlagHint(args) ?? (err as Error).message.split('\n')[0]} (usage: ${usage})`);
  }
}

/** Flags that had another name once: one name for one thing, and the old one answered with the new. */
export const renamedFlags: Readonly<Record<string, string>> = { '--sample-rate': '--sample-rate-hz' };

/** "--sample-rate is now --sample-rate-hz" when the arguments use an old name, else undefined. */
export function renamedFlagHint(args: readonly string[]): string | undefined {
  for (const arg of args) {
    const name = arg.split('=')[0]!;
    const now = renamedFlags[name];
    if (now) return `${name} is now ${now}`;
  }
  return undefined;
}

/**
 * A number flag that must pass `test`; `rule` says what it must be: "--segment must be a whole number of
 * samples >= 16 (got 'big')". Blank text is refused rather than read as 0.
 */
export function numberFlag(flag: string, text: string | undefined, test: (value: number) => boolean, rule: string): number | undefined {
  if (text === undefined) return undefined;
  const value = Number(text);
  if (text.trim() === '' || !Number.isFinite(value) || !test(value)) throw new CliError(`--${flag} must be ${rule} (got '${text}')`);
  return value;
}

/** A finite number > 0 ("--speed-rpm must be a number > 0"), or undefined when the flag is absent. */
export function positiveNumber(flag: string, text: string | undefined, rule = 'a number > 0'): number | undefined {
  return numberFlag(flag, text, (v) => v > 0, rule);
}

/** A whole number >= min ("--harmonics must be a whole number >= 1"), or undefined when the flag is absent. */
export function wholeNumber(flag: string, text: string | undefined, min: number, rule = `a whole number >= ${min}`): number | undefined {
  return numberFlag(flag, text, (v) => Number.isInteger(v) && v >= min, rule);
}

/** One of a fixed set of words ("--window must be one of hann, flattop, ... (got 'kaiser')"); `fallback` when absent. */
export function oneOf<T extends string>(flag: string, value: string, allowed: readonly T[]): T;
export function oneOf<T extends string>(flag: string, value: string | undefined, allowed: readonly T[]): T | undefined;
export function oneOf<T extends string>(flag: string, value: string | undefined, allowed: readonly T[], fallback: T): T;
export function oneOf<T extends string>(flag: string, value: string | undefined, allowed: readonly T[], fallback?: T): T | undefined {
  if (value === undefined) return fallback;
  if (!(allowed as readonly string[]).includes(value)) throw new CliError(`--${flag} must be one of ${allowed.join(', ')} (got '${value}')`);
  return value as T;
}

/** 'LOW-HIGH' in Hz with LOW < HIGH, e.g. '10-1000' or '2000-8000'; plain decimals, no signs or exponents. */
export function parseBand(flag: string, text: string | undefined): [number, number] | undefined {
  if (text === undefined) return undefined;
  const m = /^\s*(\d+(?:\.\d+)?)\s*-\s*(\d+(?:\.\d+)?)\s*$/.exec(text);
  const lo = m ? Number(m[1]) : NaN;
  const hi = m ? Number(m[2]) : NaN;
  if (!m || !(hi > lo)) throw new CliError(`--${flag} must be LOW-HIGH in Hz with LOW < HIGH, e.g. 10-1000 (got '${text}')`);
  return [lo, hi];
}
