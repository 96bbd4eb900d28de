/**
 * The one error type the diagnosis package throws for bad input. `code` is stable (snake_case) so that
 * the service can map it to a problem type and the CLI to exit code 2; `message` names the parameter.
 */
export class DiagnosisInputError extends Error {
  override readonly name = 'DiagnosisInputError';
  constructor(
    readonly code: DiagnosisErrorCode,
    message: string,
  ) {
    super(message);
  }
}

/** Every code a DiagnosisInputError can carry. */
export const diagnosisErrorCodes = [
  'invalid_argument', // a number out of range, a length too short
  'unknown_point', // pointId names no point of the model
  'unknown_channel', // channel or tachChannel outside the recording
  'empty_recording', // no samples to analyse
  'unknown_indicator', // an indicator name no descriptor of the registry claims
] as const;

export type DiagnosisErrorCode = (typeof diagnosisErrorCodes)[number];
