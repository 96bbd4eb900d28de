/** Decodes text input: UTF-8 by default, UTF-16 when a byte-order mark says so; the BOM is dropped. */
export function inputText(input: string | Uint8Array): string {
  if (typeof input === 'string') return input.charCodeAt(0) === 0xfeff ? input.slice(1) : input;
  if (input.length >= 2 && input[0] === 0xff && input[1] === 0xfe) return new TextDecoder('utf-16le').decode(input);
  if (input.length >= 2 && input[0] === 0xfe && input[1] === 0xff) return new TextDecoder('utf-16be').decode(input);
  // TextDecoder drops a UTF-8 BOM and replaces invalid bytes with U+FFFD, which later fails as a non-numeric cell.
  return new TextDecoder('utf-8').decode(input);
}
