/** Decodes text input: UTF-8 by default, UTF-16 when a byte-order mark says so; the BOM is dropped. */
export function inputText(input: string | Uint8Array): string {
  if (typeof input === 'string') return input.charCodeAt(0) === 0xfeff ? input.slice(1) : input;
  if (input.length >= 2 && input[0] === 0xff && input[1] === 0xfe) return new TextDecoder('utf-16le').decode(input);
  if (input.length >= 2 && input[0] === 0xfe && input[1] === 0xff) return new TextDecoder('utf-16be').decode(input);
  // TextDecoder drops a UTF-8 BOM and replaces invalid bytes with U+FFFD, which later fails as a non-numeric cell.
  return new TextDecoder('utf-8').decode(input);
}

const encoder = new TextEncoder();

/** Text input as UTF-8 bytes without a byte-order mark; bytes pass through without a copy. */
export function inputBytes(input: string | Uint8Array): Uint8Array {
  if (typeof input === 'string') return encoder.encode(input.charCodeAt(0) === 0xfeff ? input.slice(1) : input);
  if (input.length >= 2 && ((input[0] === 0xff && input[1] === 0xfe) || (input[0] === 0xfe && input[1] === 0xff))) {
    return encoder.encode(inputText(input));
  }
  if (input.length >= 3 && input[0] === 0xef && input[1] === 0xbb && input[2] === 0xbf) return input.subarray(3);
  return input;
}
