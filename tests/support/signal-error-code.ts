import { expect } from 'vitest';
import { SignalInputError } from '../../packages/signal/src/errors.js';

/**
 * Runs `run` and returns the code of the SignalInputError it throws (undefined when it throws nothing);
 * any other kind of error fails the test. Shared by the decoder tests.
 */
export function codeOf(run: () => unknown): string | undefined {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(SignalInputError);
    return (error as SignalInputError).code;
  }
  return undefined;
}
