import { readFileSync } from 'node:fs';
import fastifyMultipart from '@fastify/multipart';
import fastifyStatic from '@fastify/static';
import Fastify, { type FastifyInstance } from 'fastify';

// A stand-in for the HTTP API v1, built from tests/console/fixtures/mock-site.json, for running
// the console's browser test while the real service is incomplete. Spectra and trends are
// generated (deterministically) from the fixture's invented machines: demo data, not references.

interface FixtureMachine {
  id: string;
  name: string;
  modelVersion: number;
  worstZone: string | null;
  topHypothesis: { fault: string; component: string; score: number } | null;
  lastMeasuredAt: string | null;
  activeAlarms: number;
  points: Array<{ id: string; quantity: string; unit?: string; alarmLevel?: number; tripLevel?: number }>;
  model: { speed: { nominalRpm: number; minRpm: number; maxRpm: number } };
}

interface Fixture {
  site: { id: string; name: string };
  machines: FixtureMachine[];
  faults: Record<string, Array<{ fault: string; component: string }>>;
  alarms: Array<Record<string, unknown> & { id: string; acknowledgedAt: string | null }>;
}

export const mockKey = 'test-engineer-key';

function random(seed: number): () => number {
  // mulberry32: a small seeded generator, so every run draws the same invented spectrum
  return () => {
    seed |= 0;
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function evidenceFor(machine: FixtureMachine, speedHz: number) {
  if (machine.id === 'clarifier-drive') {
    const gmf = 18 * speedHz;
    const ev = [1, 2, 3, 4, 5].map((k) => ({ label: `${k}×`, frequencyHz: k * speedHz, predicted: 0.02 / k, measured: k <= 4 ? 0.018 / k : null, snrDb: k <= 4 ? 14 - k : null, matched: k <= 4 }));
    ev.push({ label: 'GMF', frequencyHz: gmf, predicted: 0.3, measured: 0.28, snrDb: 25, matched: true });
    for (const s of [-3, -2, -1, 1, 2, 3]) {
      ev.push({ label: `GMF${s < 0 ? '-' : '+'}${Math.abs(s)}×`, frequencyHz: gmf + s * speedHz, predicted: 0.05 / Math.abs(s), measured: Math.abs(s) < 3 ? 0.045 / Math.abs(s) : null, snrDb: Math.abs(s) < 3 ? 12 : null, matched: Math.abs(s) < 3 });
    }
    return [
      { fault: 'gear-missing-tooth', component: 'pinion-1', score: 0.83, reason: 'shaft harmonics and mesh sidebands of pinion-1 match the tooth-drop prediction', domain: 'spectrum', evidence: ev },
      { fault: 'bearing-outer-race', component: 'input-de', score: 0.12, reason: 'no BPFO family in the envelope', domain: 'envelope', evidence: [1, 2, 3].map((k) => ({ label: `${k}×BPFO`, frequencyHz: k * 3.58 * speedHz, predicted: 0.01 / k, measured: null, snrDb: null, matched: false })) },
    ];
  }
  if (machine.id === 'raw-water-pump-2') {
    return [
      { fault: 'bearing-outer-race', component: 'pump-nde', score: 0.71, reason: 'BPFO and harmonics in the envelope spectrum', domain: 'envelope', evidence: [1, 2, 3, 4].map((k) => ({ label: `${k}×BPFO`, frequencyHz: k * 3.07 * speedHz, predicted: 0.02 / k, measured: k < 4 ? 0.018 / k : null, snrDb: k < 4 ? 16 - 2 * k : null, matched: k < 4 })) },
      { fault: 'misalignment', component: 'motor', score: 0.2, reason: '2× is low', domain: 'spectrum', evidence: [1, 2, 3].map((k) => ({ label: `${k}×`, frequencyHz: k * speedHz, predicted: 0.05, measured: k === 1 ? 0.05 : null, snrDb: k === 1 ? 20 : null, matched: k === 1 })) },
    ];
  }
  return [{ fault: 'unbalance', component: 'impeller', score: 0.21, reason: '1× within normal', domain: 'spectrum', evidence: [{ label: '1×', frequencyHz: speedHz, predicted: 1, measured: 0.6, snrDb: 18, matched: true }] }];
}

function analysisFor(machine: FixtureMachine, recordingId: string, seed: number) {
  const speedHz = machine.model.speed.nominalRpm / 60;
  const rand = random(seed);
  const n = 16384;
  const df = 0.5;
  const frequenciesHz = Array.from({ length: n }, (_, i) => i * df);
  const values = frequenciesHz.map((f) => 0.0005 * (0.3 + rand()) * (1 + 200 / (f + 20)));
  const hypotheses = evidenceFor(machine, speedHz);
  for (const e of hypotheses[0]!.evidence) {
    if (hypotheses[0]!.domain !== 'spectrum' || e.measured === null) continue;
    const i = Math.round(e.frequencyHz / df);
    if (i < n) values[i] = e.measured;
  }
  const envF = Array.from({ length: 2048 }, (_, i) => i * 0.25);
  const envelope = envF.map(() => 0.0008 * (0.3 + rand()));
  for (const h of hypotheses) {
    if (h.domain !== 'envelope') continue;
    for (const e of h.evidence) if (e.measured !== null) envelope[Math.round(e.frequencyHz / 0.25)] = e.measured;
  }
  const indicators: Record<string, number> = { velocity_rms_mm_per_s: 3.1, acceleration_peak: 0.9, crest_factor: 4.2, kurtosis: 3.8 };
  for (const h of hypotheses) indicators[`score:${h.fault}:${h.component}`] = h.score;
  return {
    id: `an-${recordingId}`,
    recordingId,
    modelVersion: machine.modelVersion,
    createdAt: '2025-03-03T06:00:05Z',
    softwareVersion: '0.1.0-mock',
    speedHz,
    speedSource: machine.id === 'clarifier-drive' ? 'tach' : 'spectrum',
    domain: 'frequency',
    overall: { velocityRmsMmPerS: machine.worstZone === 'C' ? 7.4 : 3.1, bandHz: [10, 1000], zone: machine.worstZone, accelerationPeak: 0.9, accelerationUnit: 'g', crestFactor: 4.2, kurtosis: 3.8, envelopeRms: 0.004 },
    indicators,
    spectrum: { quantity: 'acceleration', unit: 'g', scaling: 'peak', frequencyResolutionHz: df, frequenciesHz, values },
    envelopeSpectrum: { bandHz: [2000, 5000], unit: 'g', frequenciesHz: envF, values: envelope },
    ...(machine.id === 'clarifier-drive'
      ? { orderSpectrum: { shaft: 'input', orders: Array.from({ length: 4000 }, (_, i) => i * 0.02), values: Array.from({ length: 4000 }, (_, i) => (i % 50 === 0 ? 0.01 : 0.0005 * (0.3 + rand()))) } }
      : {}),
    hypotheses,
    unexplainedPeaks: [{ frequencyHz: 100, amplitude: 0.004, snrDb: 9 }],
    warnings: [],
  };
}

function weeks(count: number, end: Date): string[] {
  const monday = new Date(end);
  monday.setUTCHours(0, 0, 0, 0);
  monday.setUTCDate(monday.getUTCDate() - ((monday.getUTCDay() + 6) % 7));
  return Array.from({ length: count }, (_, i) => new Date(monday.getTime() - (count - 1 - i) * 7 * 86_400_000).toISOString());
}

export async function startMockApi(fixturePath: string, consoleDir: string): Promise<{ app: FastifyInstance; url: string; key: string; uploads: string[] }> {
  const fixture = JSON.parse(readFileSync(fixturePath, 'utf8')) as Fixture;
  const uploads: string[] = [];
  const recordings = new Map<string, Array<{ id: string; recordedAt: string; machine: FixtureMachine }>>();
  const end = new Date('2025-03-03T06:00:00Z');
  for (const m of fixture.machines) {
    for (const p of m.points) {
      recordings.set(`${m.id}/${p.id}`, [0, 1, 2].map((k) => ({ id: `${m.id}-${p.id}-r${k}`, recordedAt: new Date(end.getTime() - k * 7 * 86_400_000).toISOString(), machine: m })));
    }
  }
  const allRecordings = () => [...recordings.values()].flat();
  const machineOf = (id: string) => fixture.machines.find((m) => m.id === id);

  const app = Fastify({ logger: false });
  await app.register(fastifyMultipart, { limits: { fileSize: 64 * 1024 * 1024 } });
  app.addHook('onRequest', async (request, reply) => {
    if (!request.url.startsWith('/api/')) return;
    if (request.headers.authorization !== `Bearer ${mockKey}`) {
      return reply.code(401).type('application/problem+json').send({ type: 'https://kinespec.invalid/problems/unauthorised', title: 'Unauthorised', status: 401, detail: 'missing or unknown API key' });
    }
  });
  const notFound = (reply: { code: (n: number) => { type: (t: string) => { send: (b: unknown) => unknown } } }, detail: string) =>
    reply.code(404).type('application/problem+json').send({ type: 'https://kinespec.invalid/problems/not-found', title: 'Not found', status: 404, detail });

  app.get('/api/v1/site', async () => fixture.site);
  app.get('/api/v1/machines', async () =>
    fixture.machines.map(({ points, model: _m, ...m }) => ({
      ...m,
      mainIndicator: {
        indicator: 'velocity_rms_mm_per_s',
        unit: 'mm/s',
        sparkline: weeks(12, end).map((start, i) => ({ start, mean: m.worstZone === 'C' ? 3 + i * 0.4 : m.topHypothesis && m.topHypothesis.score > 0.5 ? 2 + i * i * 0.02 : 1.2 + 0.05 * Math.sin(i) })),
      },
      // the rising machine in zone C is foreseen to reach zone D in three weeks
      soonestCrossing: m.worstZone === 'C' ? mockCrossing(points[0]!.id) : null,
    })),
  );
  function mockCrossing(pointId: string) {
    const remainingS = 21 * 86_400;
    return { pointId, indicator: 'velocity_rms_mm_per_s', unit: 'mm/s', level: 'zone D' as const, threshold: 7.1, crossingAt: new Date(end.getTime() + remainingS * 1000).toISOString(), remainingS, lowS: 12 * 86_400, highS: 40 * 86_400 };
  }
  app.get<{ Params: { id: string } }>('/api/v1/machines/:id', async (request, reply) => {
    const m = machineOf(request.params.id);
    if (!m) return notFound(reply, `no machine '${request.params.id}'`);
    // levels belong to vibration points: tach and encoder points have none
    return { id: m.id, name: m.name, modelVersion: m.modelVersion, model: m.model, points: m.points.map((p) => (p.quantity === 'tach' || p.quantity === 'encoder' ? { ...p, alarmLevel: null, tripLevel: null } : p)) };
  });
  app.get<{ Params: { id: string; point: string } }>('/api/v1/machines/:id/points/:point/recordings', async (request, reply) => {
    const list = recordings.get(`${request.params.id}/${request.params.point}`);
    if (!list) return notFound(reply, 'no such point');
    return list.map((r) => ({ id: r.id, recordedAt: r.recordedAt, sampleRateHz: 25600, sampleCount: 65536, channels: 1, analysisId: `an-${r.id}`, velocityRmsMmPerS: 3.1, zone: r.machine.worstZone, topHypothesis: r.machine.topHypothesis }));
  });
  app.post<{ Params: { id: string; point: string } }>('/api/v1/machines/:id/points/:point/recordings', async (request, reply) => {
    const m = machineOf(request.params.id);
    const list = recordings.get(`${request.params.id}/${request.params.point}`);
    if (!m || !list) return notFound(reply, 'no such point');
    const file = await request.file();
    if (!file) return reply.code(415).type('application/problem+json').send({ type: 'x', title: 'Unsupported media type', status: 415 });
    const bytes = await file.toBuffer();
    uploads.push(`${file.filename}:${bytes.length}`);
    const id = `${m.id}-up-${uploads.length}`;
    list.unshift({ id, recordedAt: new Date().toISOString(), machine: m });
    const a = analysisFor(m, id, uploads.length);
    return reply.code(201).send({
      recordingId: id,
      duplicate: false,
      analysis: { analysisId: a.id, velocityRmsMmPerS: a.overall.velocityRmsMmPerS, zone: a.overall.zone, speedHz: a.speedHz, speedSource: a.speedSource, topHypotheses: a.hypotheses.filter((h) => h.score >= 0.5).map(({ fault, component, score, reason }) => ({ fault, component, score, reason })) },
    });
  });
  app.get<{ Params: { id: string } }>('/api/v1/recordings/:id/analysis', async (request, reply) => {
    const r = allRecordings().find((x) => x.id === request.params.id);
    if (!r) return notFound(reply, 'no such recording');
    return analysisFor(r.machine, r.id, r.id.length);
  });
  app.get<{ Querystring: { machine: string; point: string } }>('/api/v1/indicators', async (request) => {
    const m = machineOf(request.query.machine);
    if (!m) return [];
    return [
      { indicator: 'velocity_rms_mm_per_s', unit: 'mm/s', count: 12 },
      { indicator: 'kurtosis', unit: '', count: 12 },
      ...(m.topHypothesis ? [{ indicator: `score:${m.topHypothesis.fault}:${m.topHypothesis.component}`, unit: '', count: 12 }] : []),
    ];
  });
  app.get<{ Querystring: { machine: string; point: string; indicator: string; bucket?: string } }>('/api/v1/trends', async (request) => {
    const m = machineOf(request.query.machine);
    const point = m?.points.find((p) => p.id === request.query.point);
    const velocity = request.query.indicator === 'velocity_rms_mm_per_s';
    const buckets = weeks(12, end).map((start, i) => {
      const mean = velocity ? (m?.worstZone === 'C' ? 3 + i * 0.4 : 2 + i * i * 0.02) : request.query.indicator.startsWith('score:') ? Math.min(0.95, 0.1 + i * 0.07) : 3 + 0.1 * i;
      return { start, count: 7, min: mean * 0.9, mean, max: mean * 1.1, last: mean, zone: velocity ? (mean > 7.1 ? 'D' : mean > 4.5 ? 'C' : mean > 2.8 ? 'B' : 'A') : null, alarmState: velocity && point?.alarmLevel && mean > point.alarmLevel ? 'alarm' : 'normal' };
    });
    return {
      machineId: request.query.machine,
      pointId: request.query.point,
      indicator: request.query.indicator,
      unit: velocity ? 'mm/s' : '',
      bucket: request.query.bucket ?? 'week',
      ...(velocity ? { zoneBoundaries: { ab: 2.8, bc: 4.5, cd: 7.1 }, alarmLevel: point?.alarmLevel ?? null, tripLevel: point?.tripLevel ?? null } : {}),
      buckets,
      forecast: velocity && m?.worstZone === 'C' && point
        ? { method: 'mock', onsetAt: buckets[2]!.start, level: buckets[11]!.mean, values: 84, forecasts: [{ level: 'zone D', threshold: 7.1, status: 'crossing', reason: 'mock', ...mockCrossing(point.id) }] }
        : null,
    };
  });
  app.get('/api/v1/fleet/ranking', async () => [
    { machineId: 'raw-water-pump-2', pointId: 'pump-nde-v', indicator: 'velocity_rms_mm_per_s', before: 5.8, after: 7.4, rise: 1.6, risePercent: 27.6 },
    { machineId: 'clarifier-drive', pointId: 'gb-input-h', indicator: 'score:gear-missing-tooth:pinion-1', before: 0.5, after: 0.83, rise: 0.33, risePercent: 66 },
  ]);
  app.get('/api/v1/alarms', async () => fixture.alarms.map((a) => ({ ...a, currentValue: Number((a.value * 0.97).toFixed(3)), currentAt: end.toISOString() })));
  app.post<{ Params: { id: string } }>('/api/v1/alarms/:id/acknowledge', async (request, reply) => {
    const alarm = fixture.alarms.find((a) => a.id === request.params.id);
    if (!alarm) return notFound(reply, 'no such alarm');
    alarm.acknowledgedAt = new Date().toISOString();
    alarm.acknowledgedBy = 'test-engineer';
    return alarm;
  });
  app.get<{ Querystring: { machine: string } }>('/api/v1/faults', async (request) => fixture.faults[request.query.machine] ?? []);
  app.get<{ Querystring: { speedRpm: string; harmonics?: string } }>('/api/v1/signatures', async (request) => {
    const speedHz = Number(request.query.speedRpm) / 60;
    const harmonics = Number(request.query.harmonics ?? 10);
    const angleRev = Array.from({ length: 512 }, (_, i) => i / 512);
    // a rectangular tooth-drop pulse of 1/18 rev and its Fourier partial sums
    const waveform = angleRev.map((a) => (a < 1 / 18 ? -1 : 0));
    const partial = (N: number) => angleRev.map((a) => {
      let s = -1 / 18;
      for (let k = 1; k <= N; k++) s += (-2 / (k * Math.PI)) * Math.sin((k * Math.PI) / 18) * Math.cos(2 * Math.PI * k * (a - 1 / 36));
      return s;
    });
    return {
      lines: Array.from({ length: harmonics }, (_, k) => ({ frequencyHz: (k + 1) * speedHz, order: k + 1, amplitude: Math.abs(Math.sin(((k + 1) * Math.PI) / 18) / (k + 1)), label: `${k + 1}×` })),
      naturalFrequenciesHz: [61.5, 233],
      warnings: [],
      excitation: { angleRev, waveform, partialSums: { 3: partial(3), [harmonics]: partial(harmonics) } },
      magnification: Array.from({ length: harmonics }, (_, k) => {
        const r = ((k + 1) * speedHz) / 61.5;
        return { harmonic: k + 1, frequencyHz: (k + 1) * speedHz, factor: 1 / Math.sqrt((1 - r * r) ** 2 + (2 * 0.03 * r) ** 2) };
      }),
    };
  });
  await app.register(fastifyStatic, { root: consoleDir, prefix: '/', index: ['index.html'] });
  const url = await app.listen({ host: '127.0.0.1', port: 0 });
  return { app, url, key: mockKey, uploads };
}
