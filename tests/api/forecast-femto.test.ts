import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { encodeWav } from '@kinespec/signal';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../services/cli/src/io.js';
import { main } from '../../services/cli/src/main.js';
import { femtoAvailable, femtoDir, loadFemtoRun } from '../eval/forecast/femto-data.js';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';

/*
 * A stretch of a real run to failure (femto-learning Bearing2_1, PRONOSTIA, IEEE PHM 2012 learning set; P. Nectoux
 * et al., IEEE PHM 2012), subsampled, replayed through the real upload path of the service and given to the CLI as
 * the same files: the forecast the API answers equals the one `kinespec trend` prints, field for field.
 */

const present = femtoAvailable();
if (!present) console.log(`femto-learning not found at ${femtoDir()}: the API/CLI forecast replay is skipped`);

const BEARING = 'Bearing2_1';
/** Every 8th snapshot from 540 on (80 s apart): the healthy plateau and the final rise, 47 recordings. */
const FIRST = 540;
const STEP = 8;
const THRESHOLD_G = 2;

describe.skipIf(!present)('a femto-learning run replayed through the upload path', () => {
  let svc: TestService;
  let site: TestSite;
  let dir: string;
  const entries: Array<{ file: string; recordedAt: string }> = [];

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'kinespec-femto-replay-'));
    const rig = readFileSync(join(femtoDir(), 'rig.json'), 'utf8');
    writeFileSync(join(dir, 'rig.json'), rig);
    svc = await startTestService(targets[0]!);
    site = await makeSite(svc.db, 'femto');
    const run = loadFemtoRun(BEARING);
    const n = run.snapshotStartS.length;
    // the run's last snapshot lands an hour before now, so that the service's year of history holds it all
    const origin = Date.now() - 3_600_000 - run.snapshotStartS[n - 1]! * 1000;
    const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/pronostia-rig/model?validFrom=${new Date(origin - 86_400_000).toISOString()}`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: rig });
    expect(put.statusCode, put.body).toBe(200);
    for (let i = FIRST; i < n; i += STEP) {
      const snapshot = run.snapshot(i);
      const horizontal = { sampleRateHz: snapshot.sampleRateHz, channels: [snapshot.channels[0]!], metadata: {} };
      const bytes = Buffer.from(encodeWav(horizontal, { format: 'float32' }));
      const file = `s${i}.wav`;
      writeFileSync(join(dir, file), bytes);
      const recordedAt = new Date(origin + run.snapshotStartS[i]! * 1000).toISOString();
      entries.push({ file, recordedAt });
      const res = await svc.app.inject({
        method: 'POST',
        url: `/api/v1/machines/pronostia-rig/points/test-h/recordings?recordedAt=${recordedAt}&unit=g`,
        headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav' },
        payload: bytes,
      });
      expect(res.statusCode, res.body).toBe(201);
    }
    writeFileSync(join(dir, 'manifest.json'), JSON.stringify(entries));
  }, 600_000);
  afterAll(async () => {
    await svc?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('answers through the API the forecast the CLI prints for the same recordings', async () => {
    let out = '';
    const io: CliIo = { out: (t) => void (out += t), err: (t) => void (out += `ERR ${t}`) };
    const code = await main(['trend', join(dir, 'manifest.json'), '--machine', join(dir, 'rig.json'), '--point', 'test-h', '--unit', 'g', '--indicator', 'acceleration_rms', '--threshold', String(THRESHOLD_G), '--json'], io);
    expect(code, out).toBe(0);
    const cli = JSON.parse(out);
    const res = await svc.app.inject({ url: `/api/v1/trends?machine=pronostia-rig&point=test-h&indicator=acceleration_rms&bucket=day&threshold=${THRESHOLD_G}`, headers: auth(site.keys.engineer) });
    expect(res.statusCode, res.body).toBe(200);
    const api = res.json();
    expect(api.unit).toBe(cli.unit);
    expect(api.forecast.values).toBe(cli.values.length);
    const { level: _which, ...value } = api.forecast.forecasts.find((f: { level: string }) => f.level === 'value');
    expect({ ...value, onsetAt: api.forecast.onsetAt, lastingLevel: api.forecast.level }).toEqual({
      lastingLevel: cli.forecast.level,
      threshold: cli.forecast.threshold,
      status: cli.forecast.status,
      reason: cli.forecast.reason,
      crossingAt: cli.forecast.crossingAt,
      remainingS: cli.forecast.remainingS,
      lowS: cli.forecast.lowS,
      highS: cli.forecast.highS,
      onsetAt: cli.forecast.onsetAt,
    });
    // the replayed stretch holds the final rise: the forecast is a real one, not two empty answers that agree
    expect(cli.forecast.onsetAt).not.toBeNull();
    expect(['crossing', 'crossed']).toContain(cli.forecast.status);
  });
});
