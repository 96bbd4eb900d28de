/**
 * The one error type the forecast package throws for bad input. `code` is stable (snake_case) so that the
 * service can map it to a problem type and the CLI to exit code 2; `message` names the parameter.
 */
export class ForecastInputError extends Error {
  override readonly name = 'ForecastInputError';
  constructor(
    readonly code: ForecastErrorCode,
    message: string,
  ) {
    super(message);
  }
}

/** Every code a ForecastInputError can carry. */
export const forecastErrorCodes = [
  'invalid_series', // times not increasing, a value not finite
  'invalid_threshold', // not a finite number
  'invalid_option', // an option out of its range
] as const;

export type ForecastErrorCode = (typeof forecastErrorCodes)[number];
