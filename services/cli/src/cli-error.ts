/** An error the CLI reports as one line on stderr with exit code 2 (bad input, bad flags). */
export class CliError extends Error {
  override readonly name = 'CliError';
  constructor(message: string, readonly exitCode = 2) {
    super(message);
  }
}
