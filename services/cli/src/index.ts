export { main } from './main.js';
export { CliError } from './cli-error.js';
export type { CliIo } from './io.js';
export type { Verb } from './verb.js';
