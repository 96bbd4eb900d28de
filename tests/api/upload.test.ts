import { request as httpRequest } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { csv, float32, json, MACHINE, modelText, multipart, POINT, sine, sineVelocityRmsMmPerS, wav } from './fixtures.js';

const url = `/api/v1/machines/${MACHINE}/points/${POINT}/recordings`;
const MAX_UPLOAD_BYTES = 400_000;

for (const target of targets) {
  describe(`POST recordings on ${target.name}`, () => {
    let svc: TestService;
    let site: TestSite;

    async function counts() {
      const [row] = await svc.db.sql<{ recordings: number; analyses: number; trends: number }[]>`
        select (select count(*)::int from recordings) as recordings, (select count(*)::int from analyses) as analyses,
               (select count(*)::int from trend_values) as trends`;
      return row!;
    }

    function upload(headers: Record<string, string>, payload: Buffer | string, query = '') {
      return svc.app.inject({ method: 'POST', url: url + query, headers: { ...auth(site.keys.logger), ...headers }, payload });
    }

    beforeAll(async () => {
      svc = await startTestService(target, { maxUploadBytes: MAX_UPLOAD_BYTES });
      site = await makeSite(svc.db, 'uploads');
      const put = await svc.app.inject({
        method: 'PUT', url: `/api/v1/machines/${MACHINE}/model`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText,
      });
      expect(put.statusCode).toBe(200);
    });
    afterAll(async () => svc?.close());

    describe('every format', () => {
      const cases: Array<[string, number, () => { headers: Record<string, string>; payload: Buffer | string; query?: string }]> = [
        ['audio/wav (float32)', 10, () => ({ headers: { 'content-type': 'audio/wav' }, payload: wav(sine(10)), query: '?unit=m/s%5E2' })],
        ['text/csv', 8, () => ({ headers: { 'content-type': 'text/csv' }, payload: csv(sine(8)), query: '?sampleRateHz=25600&unit=m/s%5E2' })],
        ['application/json', 6, () => ({ headers: { 'content-type': 'application/json' }, payload: json(sine(6)) })],
        ['application/octet-stream (headers)', 4, () => ({ headers: { 'content-type': 'application/octet-stream', 'x-sample-rate-hz': '25600', 'x-unit': 'm/s^2', 'x-sample-format': 'float32' }, payload: float32(sine(4)) })],
        ['application/octet-stream (query)', 3, () => ({ headers: { 'content-type': 'application/octet-stream' }, payload: float32(sine(3)), query: '?sampleRateHz=25600&unit=m/s%5E2' })],
        ['multipart/form-data', 2, () => {
          const form = multipart({ unit: 'm/s^2' }, { name: 'field.wav', type: 'audio/wav', bytes: wav(sine(2)) });
          return { headers: { 'content-type': form.contentType }, payload: form.body };
        }],
      ];
      for (const [name, amplitude, make] of cases) {
        it(`stores and analyses ${name}, reading the sine's r.m.s. velocity`, async () => {
          const { headers, payload, query } = make();
          const res = await upload(headers, payload, query ?? '');
          expect(res.statusCode, res.body).toBe(201);
          const body = res.json();
          expect(body.duplicate).toBe(false);
          expect(res.headers.location).toBe(`/api/v1/recordings/${body.recordingId}`);
          // A / (2 pi f sqrt 2), see fixtures.ts; 2 % covers the window and band edges
          expect(body.analysis.velocityRmsMmPerS).toBeCloseTo(sineVelocityRmsMmPerS(amplitude), 0);
          expect(Math.abs(body.analysis.velocityRmsMmPerS / sineVelocityRmsMmPerS(amplitude) - 1)).toBeLessThan(0.02);
          const meta = await svc.app.inject({ method: 'GET', url: `/api/v1/recordings/${body.recordingId}`, headers: auth(site.keys.engineer) });
          expect(meta.json()).toMatchObject({ machineId: MACHINE, pointId: POINT, sampleRateHz: 25600, sampleCount: 2 ** 15, channels: 1 });
        });
      }
    });

    describe('idempotent retries', () => {
      it('returns the first result for a repeated Idempotency-Key and stores nothing twice', async () => {
        const body = wav(sine(1.5));
        const first = await upload({ 'content-type': 'audio/wav', 'idempotency-key': 'logger-7:2025-03-14T08:00' }, body, '?unit=m/s%5E2');
        expect(first.statusCode).toBe(201);
        const before = await counts();
        const again = await upload({ 'content-type': 'audio/wav', 'idempotency-key': 'logger-7:2025-03-14T08:00' }, body, '?unit=m/s%5E2');
        expect(again.statusCode).toBe(200);
        expect(again.json()).toMatchObject({ recordingId: first.json().recordingId, duplicate: true, analysis: { analysisId: first.json().analysis.analysisId } });
        expect(await counts()).toEqual(before);
      });

      it('recognises a retry without a key by its content hash', async () => {
        const body = float32(sine(1.25));
        const headers = { 'content-type': 'application/octet-stream', 'x-sample-rate-hz': '25600', 'x-unit': 'm/s^2' };
        const first = await upload(headers, body);
        const before = await counts();
        const again = await upload(headers, body);
        expect([first.statusCode, again.statusCode]).toEqual([201, 200]);
        expect(again.json().recordingId).toBe(first.json().recordingId);
        expect(await counts()).toEqual(before);
      });

      it('answers 409 when a key is reused for other content, storing nothing', async () => {
        await upload({ 'content-type': 'audio/wav', 'idempotency-key': 'reused-key' }, wav(sine(1.1)), '?unit=m/s%5E2');
        const before = await counts();
        const res = await upload({ 'content-type': 'audio/wav', 'idempotency-key': 'reused-key' }, wav(sine(1.2)), '?unit=m/s%5E2');
        expect(res.statusCode).toBe(409);
        expect(res.json().type).toBe('urn:kinespec:problem:idempotency-key-reused');
        expect(await counts()).toEqual(before);
      });

      it('stores one recording when the same retry arrives twice at once', async () => {
        const body = wav(sine(1.05));
        const before = await counts();
        const [a, b] = await Promise.all([
          upload({ 'content-type': 'audio/wav', 'idempotency-key': 'race' }, body, '?unit=m/s%5E2'),
          upload({ 'content-type': 'audio/wav', 'idempotency-key': 'race' }, body, '?unit=m/s%5E2'),
        ]);
        expect([a.statusCode, b.statusCode].sort()).toEqual([200, 201]);
        expect(a.json().recordingId).toBe(b.json().recordingId);
        expect((await counts()).recordings).toBe(before.recordings + 1);
      });
    });

    describe('bad bodies', () => {
      const truncatedWav = () => wav(sine(1)).subarray(0, 30);
      const nanRaw = () => {
        const x = sine(1);
        x[100] = Number.NaN;
        return float32(x);
      };
      const cases: Array<[string, Record<string, string>, () => Buffer | string, string, number, number, string?]> = [
        ['a truncated WAV', { 'content-type': 'audio/wav' }, truncatedWav, '', 400, 0, 'recording-wav-truncated'],
        ['bytes that are not WAV', { 'content-type': 'audio/wav' }, () => Buffer.from('not a riff file at all'), '', 400, 0],
        ['a NaN sample in raw floats', { 'content-type': 'application/octet-stream', 'x-sample-rate-hz': '25600', 'x-unit': 'm/s^2' }, nanRaw, '', 422, 0, 'recording-non-finite-sample'],
        ['a NaN cell in a CSV', { 'content-type': 'text/csv' }, () => 'acc\n0.1\nNaN\n0.3\n', '?sampleRateHz=1000&unit=g', 400, 422],
        ['JSON that is not a recording', { 'content-type': 'application/json' }, () => '{"sampleRateHz": 1000, "hello": 1}', '', 422, 0, 'recording-json-schema'],
        ['broken JSON', { 'content-type': 'application/json' }, () => '{"sampleRateHz": 25600, "channels": [', '', 400, 0, 'recording-json-syntax'],
        ['an empty body', { 'content-type': 'audio/wav' }, () => Buffer.alloc(0), '', 400, 0, 'recording-empty-input'],
        ['raw floats without a sample rate', { 'content-type': 'application/octet-stream' }, () => float32(sine(1)), '', 400, 0, 'missing-sample-rate'],
        ['raw bytes that are not whole floats', { 'content-type': 'application/octet-stream', 'x-sample-rate-hz': '25600' }, () => Buffer.alloc(4003), '', 400, 0, 'recording-raw-size-mismatch'],
        ['a wrong content type', { 'content-type': 'image/png' }, () => Buffer.from([0x89, 0x50, 0x4e, 0x47]), '', 415, 0, 'unsupported-media-type'],
        ['an oversized body', { 'content-type': 'application/octet-stream', 'x-sample-rate-hz': '25600' }, () => Buffer.alloc(MAX_UPLOAD_BYTES + 4), '', 413, 0, 'payload-too-large'],
        ['an oversized multipart file', {}, () => Buffer.alloc(0), 'multipart', 413, 0, 'payload-too-large'],
        ['a bad sample rate header', { 'content-type': 'application/octet-stream', 'x-sample-rate-hz': 'fast' }, () => float32(sine(1)), '', 400, 0, 'validation-failed'],
      ];
      for (const [name, headers, payload, query, status, otherStatus, type] of cases) {
        it(`answers ${name} with a problem and stores nothing`, async () => {
          const before = await counts();
          let res;
          if (query === 'multipart') {
            const form = multipart({}, { name: 'big.f32', type: 'application/octet-stream', bytes: Buffer.alloc(MAX_UPLOAD_BYTES + 4) });
            res = await upload({ 'content-type': form.contentType }, form.body);
          } else {
            res = await upload(headers, payload(), query);
          }
          expect([status, otherStatus]).toContain(res.statusCode);
          expect(res.headers['content-type']).toMatch(/^application\/problem\+json/);
          const problem = res.json();
          expect(problem.status).toBe(res.statusCode);
          expect(problem.type).toMatch(/^urn:kinespec:problem:/);
          if (type) expect(problem.type).toBe(`urn:kinespec:problem:${type}`);
          expect(typeof problem.title).toBe('string');
          expect(typeof problem.detail).toBe('string');
          expect(JSON.stringify(problem)).not.toMatch(/\n\s+at |node_modules|\.ts:\d+/);
          expect(await counts()).toEqual(before);
        });
      }
    });

    describe('over a real socket', () => {
      let base: string;
      beforeAll(async () => {
        base = await svc.app.listen({ host: '127.0.0.1', port: 0 });
      });

      it('accepts a WAV upload and reads it back', async () => {
        const res = await fetch(base + url + '?unit=m/s%5E2', { method: 'POST', headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' }, body: wav(sine(5)) });
        expect(res.status).toBe(201);
        const body = (await res.json()) as { recordingId: string; analysis: { velocityRmsMmPerS: number } };
        expect(Math.abs(body.analysis.velocityRmsMmPerS / sineVelocityRmsMmPerS(5) - 1)).toBeLessThan(0.02);
        const analysis = await fetch(`${base}/api/v1/recordings/${body.recordingId}/analysis`, { headers: auth(site.keys.engineer) });
        const a = (await analysis.json()) as { spectrum: { frequenciesHz: number[]; values: number[] }; current: boolean };
        expect(a.current).toBe(true);
        // the plot spectrum is downsampled to at most 2048 points and keeps its peak at f = 1000 / (2 pi) Hz
        expect(a.spectrum.frequenciesHz.length).toBeLessThanOrEqual(2048);
        const peak = a.spectrum.values.indexOf(Math.max(...a.spectrum.values));
        expect(Math.abs(a.spectrum.frequenciesHz[peak]! - 1000 / (2 * Math.PI))).toBeLessThan(5);
      });

      it('cuts off a streamed body without Content-Length once it passes the limit', async () => {
        const before = await counts();
        const { status, body } = await new Promise<{ status: number; body: string }>((resolve, reject) => {
          const u = new URL(base + url);
          const req = httpRequest({ host: u.hostname, port: u.port, path: u.pathname, method: 'POST', headers: { ...auth(site.keys.logger), 'content-type': 'application/octet-stream', 'x-sample-rate-hz': '25600', 'transfer-encoding': 'chunked' } }, (res) => {
            let text = '';
            res.on('data', (c) => (text += c));
            res.on('end', () => resolve({ status: res.statusCode ?? 0, body: text }));
          });
          req.on('error', reject);
          const chunk = Buffer.alloc(64 * 1024);
          let sent = 0;
          const pump = () => {
            while (sent < MAX_UPLOAD_BYTES * 2) {
              sent += chunk.length;
              if (!req.write(chunk)) return req.once('drain', pump);
            }
            req.end();
          };
          pump();
        });
        expect(status).toBe(413);
        expect(JSON.parse(body).type).toBe('urn:kinespec:problem:payload-too-large');
        expect(await counts()).toEqual(before);
      });
    });
  });
}
