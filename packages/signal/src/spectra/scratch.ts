/**
 * Temporary arrays reused from one call to the next, one per named use. A Welch spectrum or an envelope of a
 * 65,536-sample record needs several megabytes of short-lived arrays (a 65,536-point complex transform alone
 * holds 1 MB), and allocating them afresh on every call costs about as much as the transforms (zeroing, and the
 * garbage collections they trigger). Each use site owns its slot: it takes the array at the start of a call and is
 * done with it before it returns, and calls nothing that takes the same slot meanwhile. The arrays come back
 * holding what the last call left in them: the caller writes every element it reads. Arrays above
 * SCRATCH_LIMIT elements are allocated afresh and not kept, so that one long record does not pin its memory.
 */
const slots = new Map<string, Float64Array>();

/** Largest scratch array kept between calls: 2^18 doubles (2 MB), a complex transform of 131,072 points. */
export const SCRATCH_LIMIT = 1 << 18;

/** A Float64Array of exactly `length` elements, contents unspecified, reused between calls for the same slot. */
export function scratchArray(slot: string, length: number): Float64Array {
  if (length > SCRATCH_LIMIT) return new Float64Array(length);
  let a = slots.get(slot);
  if (!a || a.length < length) {
    a = new Float64Array(length);
    slots.set(slot, a);
  }
  return a.length === length ? a : a.subarray(0, length);
}
