import { readFileSync } from 'node:fs';

let cached: string | null = null;

/** The version of the Kinespec installation (root package.json). */
export function serviceVersion(): string {
  if (cached === null) {
    const pkg = JSON.parse(readFileSync(new URL('../../../package.json', import.meta.url), 'utf8')) as { version: string };
    cached = pkg.version;
  }
  return cached;
}
