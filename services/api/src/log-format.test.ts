import { describe, expect, it } from 'vitest';
import { formatLogLine } from './log-format.js';

describe('formatLogLine', () => {
  const time = new Date(2025, 2, 14, 8, 14, 3).getTime();
  it('shortens a request line to method, URL, status and time', () => {
    const line = JSON.stringify({ level: 30, time, pid: 1, hostname: 'h', name: 'kinespec', msg: 'request', method: 'GET', url: '/api/v1/machines', status: 200, ms: 12 });
    expect(formatLogLine(line)).toBe('08:14:03 INFO  GET /api/v1/machines 200 12 ms');
  });

  it('keeps a message and its fields, and the stack of an error', () => {
    const line = JSON.stringify({ level: 50, time, msg: 'demo seeding failed', machine: 'fan 1', err: { message: 'boom', stack: 'Error: boom\n    at x' } });
    expect(formatLogLine(line)).toBe('08:14:03 ERROR demo seeding failed  machine="fan 1"\nError: boom\n    at x');
  });

  it('passes through what is not a JSON object', () => {
    expect(formatLogLine('plain text')).toBe('plain text');
  });
});
