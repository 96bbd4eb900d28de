import { recordedAtMetadataKeys, type Recording } from '@kinespec/signal';
import { problem, ProblemError } from './problems.js';

/*
 * When a recording was taken, from whichever source gives it: the upload's ?recordedAt= or X-Recorded-At,
 * else the file's own metadata (JSON `metadata.recordedAt`, a CSV `# recordedAt=` comment, ...), else the
 * time it arrived. Every source passes the same checks, because only the newest recording of a point moves
 * its alarms: one recording dated years ahead would hold that point's alarms still for good.
 */

/** How far ahead of the server's clock a recording may be dated: a logger's clock may run a little fast. */
export const MAX_FUTURE_SKEW_MS = 86_400_000;

/** The earliest time accepted (no digital vibration recording is older; it also keeps every time in PostgreSQL's range). */
export const EARLIEST_RECORDED_AT = new Date('1900-01-01T00:00:00Z');

/** Throws the problem for a time out of [EARLIEST_RECORDED_AT, now + MAX_FUTURE_SKEW_MS]; `source` names where it came from. */
export function checkRecordedAt(at: Date, source: string, now: Date = new Date()): Date {
  if (Number.isNaN(at.getTime()) || at < EARLIEST_RECORDED_AT) {
    throw problem('time-out-of-range', `${source} (${Number.isNaN(at.getTime()) ? 'not a date' : at.toISOString()}) lies before ${EARLIEST_RECORDED_AT.toISOString().slice(0, 10)}`, {
      errors: [{ path: source, message: `must lie on or after ${EARLIEST_RECORDED_AT.toISOString()}` }],
    });
  }
  if (at.getTime() > now.getTime() + MAX_FUTURE_SKEW_MS) {
    throw problem('recorded-in-future', `${source} (${at.toISOString()}) lies more than a day after the server's clock (${now.toISOString()}); check the logger's clock`, {
      errors: [{ path: source, message: 'lies more than a day in the future' }],
    });
  }
  return at;
}

/**
 * The recording time of an upload: the request's (already parsed) time, else the first metadata key that
 * parses as a date, else `now`. A metadata value that is no date at all is left as metadata and ignored.
 */
export function recordedAtOf(requestTime: Date | null, recording: Pick<Recording, 'metadata'>, now: Date = new Date()): Date {
  if (requestTime) return checkRecordedAt(requestTime, 'query.recordedAt', now);
  // the keys a file may give its recording time in, in order of preference (one list: @kinespec/signal's)
  for (const key of recordedAtMetadataKeys) {
    const text = recording.metadata[key];
    if (!text) continue;
    const at = new Date(text);
    if (!Number.isNaN(at.getTime())) return checkRecordedAt(at, `file.metadata.${key}`, now);
  }
  return now;
}

export function isTimeProblem(err: unknown): boolean {
  return err instanceof ProblemError && (err.problem.slug === 'time-out-of-range' || err.problem.slug === 'recorded-in-future');
}
