import type { AnalysisSummary, RecordingAnalysis, RecordingMeta } from './api-types.js';

/*
 * An upload's answer carries the summary of its analysis when the analysis is stored within the service's wait;
 * otherwise it answers 202 ("analysisState": "queued") and the analysis follows on
 * GET /api/v1/recordings/{id}/analysis. This makes the same summary from that analysis and the recording, so the
 * upload card reads alike either way (the server's summary: ingest.ts summarise).
 */

/** The summary of a stored analysis of a recording, as the upload answer gives it. */
export function summaryOfAnalysis(analysis: RecordingAnalysis, recording: Pick<RecordingMeta, 'channelInfo' | 'warnings'>): AnalysisSummary {
  const v = analysis.overall?.velocityRmsMmPerS;
  return {
    analysisId: analysis.id,
    velocityRmsMmPerS: typeof v === 'number' && Number.isFinite(v) ? v : null,
    zone: analysis.overall?.zone ?? null,
    speedHz: typeof analysis.speedHz === 'number' && Number.isFinite(analysis.speedHz) ? analysis.speedHz : null,
    speedSource: analysis.speedSource ?? null,
    // hypotheses come highest score first
    topHypotheses: (analysis.hypotheses ?? []).slice(0, 5).map((h) => ({ fault: h.fault, component: h.component, score: h.score, reason: h.reason })),
    // the file's warnings first, then the analysis's
    warnings: [...(recording.warnings ?? []), ...(analysis.warnings ?? [])],
    // the analysis counts channels from 0, people from 1
    analysedChannel: typeof analysis.channel === 'number' ? analysis.channel + 1 : null,
    channels: recording.channelInfo.map((c) => ({ name: c.name, unit: c.unit })),
  };
}

/** True for the answer GET /recordings/{id}/analysis gives while the analysis is still queued (202). */
export function isQueued(body: unknown): boolean {
  return typeof body === 'object' && body !== null && (body as { analysisState?: unknown }).analysisState === 'queued';
}
