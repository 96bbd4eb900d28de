/** One channel of a recording, in engineering units after any sensitivity is applied. */
export interface Channel {
  name: string;
  /** Unit of `samples`, e.g. 'g', 'm/s^2', 'mm/s', 'um', 'V', 'counts'. */
  unit: string;
  samples: Float64Array;
}

/** What every decoder returns: equally spaced samples of one or more channels. */
export interface Recording {
  sampleRateHz: number;
  channels: Channel[];
  /** Free-form metadata carried by the file (CSV `# key=value` lines, JSON extra fields, WAV LIST chunks). */
  metadata: Record<string, string>;
}
