import { describe, expect, it } from 'vitest';
import { isKnownMetadataKey, nearestMetadataKey, recordedAtFromMetadata } from './metadata-keys.js';

describe('metadata keys', () => {
  it('knows the keys Kinespec reads in any case and punctuation, and those the simulator writes', () => {
    for (const key of ['sampleRateHz', 'sample_rate', 'FS', 'unit', 'Units', 'channel_names', 'recorded_at', 'tachChannel', 'meanSpeedRpm']) {
      expect(isKnownMetadataKey(key), key).toBe(true);
    }
    expect(isKnownMetadataKey('operator')).toBe(false);
  });

  it('points a near miss to a key that is read, never to one only written for people', () => {
    expect(nearestMetadataKey('unti')).toBe('unit');
    expect(nearestMetadataKey('recordedAd')).toBe('recordedAt');
    expect(nearestMetadataKey('tachChanel')).toBe('tachChannel');
    expect(nearestMetadataKey('machine')).toBeUndefined();
    expect(nearestMetadataKey('unit')).toBeUndefined();
  });

  it('reads the recording time from the first recordedAt-like key that parses', () => {
    expect(recordedAtFromMetadata({ recordedAt: 'not a date', start_time: '2025-03-14T08:00:00Z' })?.toISOString()).toBe('2025-03-14T08:00:00.000Z');
    expect(recordedAtFromMetadata({ comment: '2025-03-14' })).toBeUndefined();
  });
});
