/**
 * The one error type the simulator throws for bad options. `code` is stable (snake_case);
 * `message` names the option that is wrong.
 */
export class SimulatorInputError extends Error {
  override readonly name = 'SimulatorInputError';
  constructor(
    readonly code: string,
    message: string,
  ) {
    super(message);
  }
}
