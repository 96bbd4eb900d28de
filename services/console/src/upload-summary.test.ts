import { describe, expect, it } from 'vitest';
import type { RecordingAnalysis } from './api-types.js';
import { isQueued, summaryOfAnalysis } from './upload-summary.js';

describe('summaryOfAnalysis', () => {
  it("makes the upload answer's summary from a polled analysis and its recording", () => {
    const analysis = {
      id: 'a1',
      speedHz: 24.6,
      speedSource: 'spectrum',
      overall: { velocityRmsMmPerS: 3.1, zone: 'C' },
      hypotheses: Array.from({ length: 7 }, (_, i) => ({ fault: `f${i}`, component: 'c', score: 1 - i / 10, reason: `r${i}`, domain: 'spectrum', evidence: [] })),
      warnings: ['speed: the nominal speed was used'],
      channel: 1,
    } as unknown as RecordingAnalysis;
    const s = summaryOfAnalysis(analysis, { channelInfo: [{ name: 'axial', unit: 'g' }, { name: 'radial', unit: 'g' }], warnings: ["unit: not stated; read in the point's unit"] });
    expect(s).toMatchObject({ analysisId: 'a1', velocityRmsMmPerS: 3.1, zone: 'C', speedHz: 24.6, speedSource: 'spectrum', analysedChannel: 2 });
    expect(s.topHypotheses.map((h) => h.fault)).toEqual(['f0', 'f1', 'f2', 'f3', 'f4']);
    expect(s.warnings).toEqual(["unit: not stated; read in the point's unit", 'speed: the nominal speed was used']);
    expect(s.channels).toEqual([{ name: 'axial', unit: 'g' }, { name: 'radial', unit: 'g' }]);
  });

  it('gives null for what the analysis did not find, and tells a queued answer from an analysis', () => {
    const analysis = { id: 'a2', speedHz: null, speedSource: null, overall: { velocityRmsMmPerS: Number.NaN, zone: null }, hypotheses: [], warnings: [] } as unknown as RecordingAnalysis;
    expect(summaryOfAnalysis(analysis, { channelInfo: [] })).toMatchObject({ velocityRmsMmPerS: null, zone: null, speedHz: null, analysedChannel: null, topHypotheses: [], warnings: [] });
    expect(isQueued({ recordingId: 'r', analysisState: 'queued' })).toBe(true);
    expect(isQueued(analysis)).toBe(false);
    expect(isQueued(null)).toBe(false);
  });
});
