/**
 * The one error type the signal package throws for bad input. `code` is stable (snake_case)
 * so that the service can map it to a problem type; `message` is written for a technician.
 */
export class SignalInputError extends Error {
  override readonly name = 'SignalInputError';
  constructor(
    readonly code: string,
    message: string,
    /** Where in the input the problem is, e.g. 'line 12', 'byte 44', 'channels[1].samples[7]'. */
    readonly where?: string,
  ) {
    super(message);
  }
}
