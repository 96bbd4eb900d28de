// Layout constants of RIFF/WAVE files shared by the decoder and the encoder.
// Sources: Microsoft & IBM, "Multimedia Programming Interface and Data Specifications 1.0" (1991), RIFF and
// WAVE chunks; Microsoft, "New Multimedia Data Types and Data Techniques" rev. 3.0 (1994), IEEE float and
// the fact chunk; Microsoft Learn, "WAVEFORMATEXTENSIBLE structure" (mmreg.h), the extensible fmt chunk.

export const WAVE_FORMAT_PCM = 0x0001;
export const WAVE_FORMAT_IEEE_FLOAT = 0x0003;
export const WAVE_FORMAT_EXTENSIBLE = 0xfffe;

/**
 * Bytes 2..15 of the KSDATAFORMAT_SUBTYPE_* GUIDs {0000xxxx-0000-0010-8000-00AA00389B71} as stored in a
 * file (Data1 little-endian): the first two bytes carry the plain format tag (1 = PCM, 3 = IEEE float).
 */
export const KSDATAFORMAT_SUBTYPE_TAIL = [0x00, 0x00, 0x00, 0x00, 0x10, 0x00, 0x80, 0x00, 0x00, 0xaa, 0x00, 0x38, 0x9b, 0x71];

/** Size of the extensible fmt chunk: 18-byte WAVEFORMATEX + cbSize 22. */
export const EXTENSIBLE_FMT_SIZE = 40;

export type WavSampleFormat = 'pcm8' | 'pcm16' | 'pcm24' | 'pcm32' | 'float32' | 'float64';

export const wavSampleFormats: readonly WavSampleFormat[] = ['pcm8', 'pcm16', 'pcm24', 'pcm32', 'float32', 'float64'];

export function sampleFormatBytes(format: WavSampleFormat): number {
  switch (format) {
    case 'pcm8':
      return 1;
    case 'pcm16':
      return 2;
    case 'pcm24':
      return 3;
    case 'pcm32':
    case 'float32':
      return 4;
    case 'float64':
      return 8;
  }
}

export function fourCC(bytes: Uint8Array, offset: number): string {
  return String.fromCharCode(bytes[offset], bytes[offset + 1], bytes[offset + 2], bytes[offset + 3]);
}
