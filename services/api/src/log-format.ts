import { Writable } from 'node:stream';

/*
 * Log lines for a person at a terminal: pino writes one JSON object per line; on a terminal each becomes
 * "08:14:03 INFO  message  key=value ...", with the request lines shortened to "GET /url 200 12 ms". Where the
 * output is not a terminal (a file, a log collector) pino's JSON goes out unchanged.
 */

const LEVELS: Record<number, string> = { 10: 'TRACE', 20: 'DEBUG', 30: 'INFO ', 40: 'WARN ', 50: 'ERROR', 60: 'FATAL' };
/** pino's own fields, shown in the line's head or not at all. */
const HIDDEN = new Set(['level', 'time', 'pid', 'hostname', 'name', 'msg', 'v', 'reqId']);

function value(v: unknown): string {
  if (typeof v === 'string') return /\s/.test(v) ? JSON.stringify(v) : v;
  return JSON.stringify(v);
}

/** One pino JSON line as a terminal line; text that is not a JSON object is passed through. */
export function formatLogLine(line: string): string {
  let entry: Record<string, unknown>;
  try {
    entry = JSON.parse(line) as Record<string, unknown>;
  } catch {
    return line;
  }
  if (typeof entry !== 'object' || entry === null) return line;
  const time = typeof entry.time === 'number' ? new Date(entry.time).toTimeString().slice(0, 8) : '--:--:--';
  const level = LEVELS[entry.level as number] ?? String(entry.level);
  if (entry.msg === 'request' && typeof entry.method === 'string') {
    return `${time} ${level} ${entry.method} ${String(entry.url)} ${String(entry.status)} ${String(entry.ms)} ms`;
  }
  const err = entry.err as { message?: string; stack?: string } | undefined;
  const rest = Object.entries(entry)
    .filter(([k]) => !HIDDEN.has(k) && k !== 'err')
    .map(([k, v]) => `${k}=${value(v)}`);
  const text = [String(entry.msg ?? ''), ...rest].filter(Boolean).join('  ');
  return `${time} ${level} ${text}${err ? `\n${err.stack ?? err.message ?? ''}` : ''}`;
}

/** A stream for pino that writes terminal lines to `out`. */
export function terminalLogStream(out: NodeJS.WritableStream): Writable {
  let pending = '';
  return new Writable({
    write(chunk: Buffer | string, _encoding, done) {
      pending += chunk.toString();
      let end = pending.indexOf('\n');
      while (end >= 0) {
        out.write(`${formatLogLine(pending.slice(0, end))}\n`);
        pending = pending.slice(end + 1);
        end = pending.indexOf('\n');
      }
      done();
    },
  });
}
