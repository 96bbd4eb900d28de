import { z } from 'zod';

/* Zod schemas shared by several routes (request parts and response pieces); they become the OpenAPI document. */

export const zoneSchema = z.enum(['A', 'B', 'C', 'D']).nullable();

export const idParam = z.string().min(1).max(64).regex(/^[A-Za-z0-9][A-Za-z0-9._:-]{0,63}$/, 'must be an id: letters, digits, . _ : -');

export const hypothesisRefSchema = z.looseObject({
  fault: z.string(),
  component: z.string(),
  score: z.number(),
});

/** Years a time in a request may name: four-digit ISO 8601 years, all inside PostgreSQL's timestamptz range. */
const MIN_YEAR = 1;
const MAX_YEAR = 9999;

export const isoTime = z
  .string()
  .max(64)
  .refine((s) => {
    const t = parseTime(s).getTime();
    if (Number.isNaN(t)) return false;
    const year = new Date(t).getUTCFullYear();
    return year >= MIN_YEAR && year <= MAX_YEAR;
  }, `must be an ISO 8601 date or date-time in the years ${MIN_YEAR}-${MAX_YEAR}, e.g. 2025-03-14T08:00:00Z`)
  .describe('ISO 8601 date or date-time (UTC when no offset is given)');

/** "2025-03-14" and "2025-03-14T08:00" read as UTC; an explicit offset is kept. */
export function parseTime(s: string): Date {
  const hasZone = /([zZ]|[+-]\d\d:?\d\d)$/.test(s);
  return new Date(/^\d{4}-\d\d-\d\d$/.test(s) ? `${s}T00:00:00Z` : hasZone ? s : `${s}Z`);
}

export const analysisSummarySchema = z.object({
  analysisId: z.string(),
  velocityRmsMmPerS: z.number().nullable(),
  zone: zoneSchema,
  speedHz: z.number().nullable(),
  speedSource: z.string().nullable(),
  topHypotheses: z.array(z.object({ fault: z.string(), component: z.string(), score: z.number(), reason: z.string() })),
  warnings: z.array(z.string()).describe("What was assumed or set aside: the decoder's warnings, then the analysis's (unit read as the point's, nominal speed used, ...)"),
  analysedChannel: z.number().nullable().describe('The channel the analysis read, numbered from 1'),
  channels: z.array(z.object({ name: z.string(), unit: z.string() })).describe('Every channel of the recording, in order'),
});

export const uploadResultSchema = z.object({
  recordingId: z.string(),
  duplicate: z.boolean(),
  /** 'queued': stored, its analysis still to come (202); poll GET /recordings/{id}/analysis. */
  analysisState: z.enum(['queued', 'done']),
  analysis: analysisSummarySchema.nullable(),
});

const evidenceSchema = z.looseObject({
  label: z.string(),
  frequencyHz: z.number().nullable(),
  predicted: z.number().nullable(),
  measured: z.number().nullable(),
  snrDb: z.number().nullable(),
  matched: z.boolean(),
  ambiguous: z.boolean().optional(),
});

const hypothesisSchema = z.looseObject({
  fault: z.string(),
  component: z.string(),
  score: z.number(),
  reason: z.string(),
  domain: z.string(),
  evidence: z.array(evidenceSchema),
});

/** The stored RecordingAnalysis (coordination contract) with its identity; fields may grow. */
export const analysisSchema = z.looseObject({
  id: z.string(),
  recordingId: z.string(),
  modelVersion: z.number().nullable(),
  createdAt: z.string(),
  current: z.boolean(),
  softwareVersion: z.string(),
  speedHz: z.number().nullable(),
  speedSource: z.string().nullable(),
  domain: z.string(),
  overall: z.looseObject({
    velocityRmsMmPerS: z.number().nullable(),
    bandHz: z.array(z.number()),
    zone: zoneSchema,
  }),
  indicators: z.record(z.string(), z.number().nullable()),
  spectrum: z.looseObject({
    quantity: z.string(),
    unit: z.string(),
    scaling: z.string(),
    frequencyResolutionHz: z.number().nullable(),
    frequenciesHz: z.array(z.number().nullable()),
    values: z.array(z.number().nullable()),
  }),
  hypotheses: z.array(hypothesisSchema),
  unexplainedPeaks: z.array(z.looseObject({ frequencyHz: z.number().nullable() })),
  warnings: z.array(z.string()),
});

export const alarmSchema = z.object({
  id: z.string(),
  machineId: z.string(),
  pointId: z.string(),
  indicator: z.string(),
  level: z.enum(['alarm', 'trip']),
  value: z.number(),
  threshold: z.number(),
  recordingId: z.string().nullable(),
  raisedAt: z.string(),
  acknowledgedAt: z.string().nullable(),
  acknowledgedBy: z.string().nullable(),
  clearedAt: z.string().nullable(),
  clearedBy: z.string().nullable(),
  /** The indicator's newest value at the point (beside `value`, the one that raised the alarm). */
  currentValue: z.number().nullable(),
  currentAt: z.string().nullable(),
});

export function iso(d: Date): string;
export function iso(d: Date | null): string | null;
export function iso(d: Date | null): string | null {
  return d === null ? null : d.toISOString();
}

/** The longest wait a request may ask for with Prefer: wait=N (RFC 7240 §4.3). */
const MAX_PREFER_WAIT_S = 120;

/** How long a request waits for queued work: its Prefer: wait=N seconds (RFC 7240) when given, else `configuredMs`. */
export function preferredWaitMs(prefer: string | string[] | undefined, configuredMs: number): number {
  const m = typeof prefer === 'string' ? /(?:^|[;,\s])wait=(\d+)/i.exec(prefer) : null;
  return m ? Math.min(Number(m[1]), MAX_PREFER_WAIT_S) * 1000 : configuredMs;
}
