import { mkdtempSync, writeFileSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from '../../../../tests/api/harness.js';
import { MACHINE, modelText, POINT, sine, wav } from '../../../../tests/api/fixtures.js';
import type { CliIo } from '../io.js';
import { main } from '../main.js';
import { retryable, retryDelayMs, uploadIdempotencyKey } from './upload.js';

function capture(): CliIo & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return { stdout, stderr, out: (t) => stdout.push(t), err: (t) => stderr.push(t) };
}

const dir = mkdtempSync(join(tmpdir(), 'kinespec-upload-'));
const fileA = join(dir, 'fan-de-h-0800.wav');
const fileB = join(dir, 'fan-de-h-0900.wav');
writeFileSync(fileA, wav(sine(3)));
writeFileSync(fileB, wav(sine(4)));

describe('uploadIdempotencyKey', () => {
  it('is the SHA-256 of machine, point and bytes, so the same file to the same point always gets the same key', () => {
    const bytes = Buffer.from('abc');
    const key = uploadIdempotencyKey('m', 'p', bytes);
    expect(key).toBe(uploadIdempotencyKey('m', 'p', Buffer.from('abc')));
    expect(key).not.toBe(uploadIdempotencyKey('m', 'q', bytes));
    expect(key).toMatch(/^sha256:[0-9a-f]{64}$/);
  });
});

describe('retry policy', () => {
  it('retries network errors, 408, 429 and 5xx, and nothing else', () => {
    expect([null, 408, 429, 500, 503].map(retryable)).toEqual([true, true, true, true, true]);
    expect([400, 401, 404, 409, 413, 415, 422].map(retryable)).toEqual([false, false, false, false, false, false, false]);
  });

  it('waits as Retry-After says, else doubles the backoff each attempt (with jitter of +-25 %)', () => {
    expect(retryDelayMs(0, 500, '3')).toBe(3000);
    for (const attempt of [0, 1, 2, 3]) {
      const d = retryDelayMs(attempt, 500, null);
      expect(d).toBeGreaterThanOrEqual(0.75 * 500 * 2 ** attempt);
      expect(d).toBeLessThanOrEqual(1.25 * 500 * 2 ** attempt);
    }
  });
});

describe('kinespec upload', () => {
  let svc: TestService;
  let site: TestSite;
  let base: string;
  beforeAll(async () => {
    svc = await startTestService(targets[0]!);
    site = await makeSite(svc.db, 'field');
    await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    base = await svc.app.listen({ host: '127.0.0.1', port: 0 });
  });
  afterAll(async () => svc?.close());

  const args = (key: string, ...files: string[]) => ['upload', ...files, '--server', base, '--key', key, '--machine', MACHINE, '--point', POINT, '--unit', 'm/s^2', '--recorded-at', '2025-03-14T08:00:00Z'];

  it('uploads each file and says what the analysis found', async () => {
    const io = capture();
    expect(await main(args(site.keys.logger, fileA, fileB), io)).toBe(0);
    expect(io.stdout).toHaveLength(2);
    expect(io.stdout[0]).toMatch(/fan-de-h-0800\.wav: recording [0-9a-f-]{36}; [\d.]+ mm\/s r\.m\.s\., zone [A-D]/);
  });

  it('stores nothing twice when run again', async () => {
    const [before] = await svc.db.sql<{ n: number }[]>`select count(*)::int as n from recordings`;
    const io = capture();
    expect(await main(args(site.keys.logger, fileA), io)).toBe(0);
    expect(io.stdout[0]).toContain('(already stored)');
    const [after] = await svc.db.sql<{ n: number }[]>`select count(*)::int as n from recordings`;
    expect(after!.n).toBe(before!.n);
  });

  it('reports a refused file in one line, does not retry it, and exits 2', async () => {
    const bad = join(dir, 'cut.wav');
    writeFileSync(bad, wav(sine(1)).subarray(0, 30));
    const io = capture();
    expect(await main(args(site.keys.logger, bad), io)).toBe(2);
    expect(io.stderr.join('\n')).toMatch(/cut\.wav: The WAV file is cut short/);
    expect(io.stderr.join('\n')).not.toMatch(/retrying/);
  });

  it('refuses bad flags with a one-line message and exit code 2', async () => {
    const io = capture();
    expect(await main(['upload', fileA, '--server', base, '--key', 'k', '--machine', MACHINE], io)).toBe(2);
    expect(io.stderr).toEqual(['kinespec upload: --point is required (usage: kinespec upload --help)']);
  });
});

describe('kinespec upload against a flaky server', () => {
  let server: Server;
  let base: string;
  const seen: Array<{ key: string | undefined; status: number }> = [];
  beforeAll(async () => {
    let calls = 0;
    server = createServer((req, res) => {
      req.resume();
      req.on('end', () => {
        calls++;
        const key = req.headers['idempotency-key'] as string | undefined;
        if (calls === 1) {
          // a dropped connection: the client sees a network error
          req.socket.destroy();
          seen.push({ key, status: 0 });
          return;
        }
        const status = calls === 2 ? 503 : calls === 3 ? 429 : 202;
        seen.push({ key, status });
        // the service's load shedding and database outages answer 503 with Retry-After, as rate limits do with 429
        res.writeHead(status, { 'content-type': 'application/json', ...(status === 429 ? { 'retry-after': '0' } : status === 503 ? { 'retry-after': '1' } : {}) });
        // at last stored, its analysis queued behind others (202)
        res.end(JSON.stringify(status === 202 ? { recordingId: 'r-1', duplicate: false, analysisState: 'queued', analysis: null } : { title: 'busy', detail: 'try later' }));
      });
    });
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
    const address = server.address();
    base = `http://127.0.0.1:${typeof address === 'object' && address ? address.port : 0}`;
  });
  afterAll(() => new Promise<void>((r) => server.close(() => r())));

  it('retries a dropped connection, a 503 and a 429 with the same Idempotency-Key, then takes a 202 as stored', async () => {
    const io = capture();
    const code = await main(['upload', fileA, '--server', base, '--key', 'k', '--machine', 'm', '--point', 'p', '--backoff-ms', '5'], io);
    expect(code).toBe(0);
    expect(seen.map((s) => s.status)).toEqual([0, 503, 429, 202]);
    expect(new Set(seen.map((s) => s.key)).size).toBe(1);
    expect(io.stderr.filter((l) => l.includes('retrying'))).toHaveLength(3);
    // the 503's Retry-After: 1 was honoured (the backoff alone would have waited about 10 ms)
    expect(io.stderr.find((l) => l.includes('HTTP 503') || l.includes('busy'))).toMatch(/retrying in 1\.0 s/);
    expect(io.stdout[0]).toContain('recording r-1');
    expect(io.stdout[0]).toContain('analysis queued: GET /api/v1/recordings/r-1/analysis');
  });
});
