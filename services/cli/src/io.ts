/** Where a verb writes: injected so that tests can capture output without a child process. */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
}

export const processIo: CliIo = {
  out: (text) => { process.stdout.write(text.endsWith('\n') ? text : `${text}\n`); },
  err: (text) => { process.stderr.write(text.endsWith('\n') ? text : `${text}\n`); },
};
