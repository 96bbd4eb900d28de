// Public surface of the recording decoders: bytes or text in, a Recording (Float64Array channels) out.
export { decodeWav, type WavDecodeOptions } from './wav-decoder.js';
export { encodeWav, type WavEncodeOptions } from './wav-encoder.js';
export { wavSampleFormats, type WavSampleFormat } from './wav-format.js';
export { decodeCsv, csvTimeStepTolerance, type CsvDecodeOptions } from './csv-decoder.js';
export { decodeJsonRecording, type JsonDecodeOptions } from './json-decoder.js';
export { decodeRaw, type RawDecodeOptions } from './raw-decoder.js';
export {
  decodeRecording,
  detectRecordingFormat,
  recordingFormats,
  type DecodeHint,
  type RecordingFormat,
} from './recording-decoder.js';
export type { Sensitivity } from './sensitivity.js';
export { recordingWarnings } from './recording-parts.js';
export { defaultDecodeLimits, type DecodeLimits } from './decode-limits.js';
export { decodeErrorCodes, decodeErrorDescriptions, type DecodeErrorCode } from './decode-error.js';
export {
  decoderMetadataKeys,
  recordedAtMetadataKeys,
  analysisMetadataKeys,
  informationalMetadataKeys,
  knownMetadataKeys,
  isKnownMetadataKey,
  nearestMetadataKey,
  recordedAtFromMetadata,
} from './metadata-keys.js';
