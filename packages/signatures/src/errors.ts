/**
 * The one error type the signatures package throws for bad input. `code` is stable (snake_case) so that
 * services can map it to a problem type; `message` names the parameter and reads on one line.
 */
export class SignatureInputError extends Error {
  override readonly name = 'SignatureInputError';
  constructor(
    readonly code: SignatureErrorCode,
    message: string,
  ) {
    super(message);
  }
}

export const signatureErrorCodes = [
  'invalid_segment', // a segment with a bad bound, value or kind
  'segments_span', // segments that do not fit in one period
  'invalid_samples', // a sampled waveform with a bad length or a non-finite value
  'invalid_harmonics', // a harmonic count that is not a whole number in range
  'invalid_parameter', // any other numeric option out of its range
  'invalid_chain', // a torsional chain with a bad inertia, stiffness or node index
  'unknown_fault', // a fault kind the table does not define
  'unknown_component', // a component id that is not in the model, or of the wrong kind for the fault
  'unknown_point', // a measurement point id that is not in the model
  'unsupported_unit', // a point unit this package cannot convert to
] as const;

export type SignatureErrorCode = (typeof signatureErrorCodes)[number];
