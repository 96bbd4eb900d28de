/*
 * Which errors mean "the database is away for now" (restarting, failing over, out of connections) rather
 * than a fault of the request or of the code. Those answer 503 with Retry-After, so that loggers retry and
 * the recording they hold is not lost; anything else stays a 500.
 */

/** Seconds a client is told to wait when the database is away: about what a PostgreSQL restart takes. */
export const DATABASE_RETRY_AFTER_S = 5;

/** postgres.js's own connection error codes, and the socket errors behind them. */
const DRIVER_CODES = new Set([
  'CONNECTION_CLOSED',
  'CONNECTION_ENDED',
  'CONNECTION_DESTROYED',
  'CONNECT_TIMEOUT',
  'ECONNREFUSED',
  'ECONNRESET',
  'EPIPE',
  'ETIMEDOUT',
  'EHOSTUNREACH',
  'ENETUNREACH',
  'ENOTFOUND',
  'EAI_AGAIN',
  'ENOENT', // a Unix socket that is not there (yet)
]);

/**
 * SQLSTATE classes and codes of a server that cannot serve now (PostgreSQL Appendix A): class 08 connection
 * exceptions, 57P01 admin_shutdown, 57P02 crash_shutdown, 57P03 cannot_connect_now, 53300 too_many_connections,
 * 40001/40P01 serialization failure and deadlock (a retry succeeds).
 */
const SERVER_CODES = new Set(['57P01', '57P02', '57P03', '53300', '53400', '40001', '40P01']);

export function isDatabaseUnavailable(err: unknown): boolean {
  if (typeof err !== 'object' || err === null) return false;
  const code = (err as { code?: unknown }).code;
  if (typeof code !== 'string') return false;
  return DRIVER_CODES.has(code) || SERVER_CODES.has(code) || /^08[0-9A-Z]{3}$/.test(code);
}
