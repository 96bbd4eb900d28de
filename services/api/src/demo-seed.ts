import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { loadMachineModel, type MachineModel } from '@kinespec/kinematics';
import { encodeWav } from '@kinespec/signal';
import { simulateRecording, type SimulatedFault } from '@kinespec/simulator';
import type { FastifyInstance, InjectOptions } from 'fastify';
import type { Sql } from './database.js';

/*
 * The demo site: an invented board mill with four machines (fixtures/machines/skelmere-*.json) and
 * twelve weeks of simulated history, two recordings a week per vibration point. On the conveyor
 * gearbox the high-speed pinion develops a broken tooth; on the induced-draught fan the drive-end
 * bearing develops an outer-race defect. The simulator only builds the vibration; every recording
 * goes through the real HTTP ingest (decode, analysis, trends, alarms), so whatever the demo shows
 * about those faults the pipeline found itself.
 */

export const DEMO_SITE_NAME = 'Skelmere board mill (demo)';

/** How far the demo's recordings are (the console shows it while they are pushed in the background). */
export interface DemoStatus {
  state: 'seeding' | 'done' | 'failed';
  recordingsDone: number;
  recordingsTotal: number;
  error?: string;
}

export interface DemoKeys {
  engineer: string;
  logger: string;
  recordings: number;
}

const machinesDir = fileURLToPath(new URL('../../../fixtures/machines/', import.meta.url));

interface DemoMachine {
  file: string;
  points: string[];
  /** The fault that develops, with the week it starts (0 = twelve weeks ago) and its final severity. */
  develops?: { fault: SimulatedFault['fault']; component: string; onsetWeek: number; finalSeverity: number };
}

export const demoMachines: DemoMachine[] = [
  {
    file: 'skelmere-conveyor-drive-2.json',
    points: ['gb-input-h', 'gb-intermediate-a', 'gb-output-v'],
    develops: { fault: 'gear-broken-tooth', component: 'hs-pinion', onsetWeek: 3, finalSeverity: 1 },
  },
  {
    file: 'skelmere-id-fan-1.json',
    points: ['motor-de-h', 'fan-de-h', 'fan-de-v'],
    develops: { fault: 'bearing-outer-race', component: 'fan-de', onsetWeek: 5, finalSeverity: 0.9 },
  },
  { file: 'skelmere-feed-pump-3.json', points: ['motor-de-h', 'pump-de-h', 'pump-de-v'] },
  { file: 'skelmere-aeration-blower-1.json', points: ['motor-de-h', 'blower-drive-h', 'blower-idle-v'] },
];

export const DEMO_WEEKS = 12;
export const DEMO_RECORDINGS_PER_WEEK = 2;
export const DEMO_SAMPLE_RATE_HZ = 25_600;
export const DEMO_SAMPLE_COUNT = 2 ** 15;

const WEEK_MS = 7 * 86_400_000;

/** Severity of a developing fault in week `week` (fractional): zero before onset, then growing faster as it goes. */
export function demoSeverity(d: NonNullable<DemoMachine['develops']>, week: number): number {
  if (week < d.onsetWeek) return 0;
  const progress = Math.min(1, (week - d.onsetWeek + 0.5) / (DEMO_WEEKS - d.onsetWeek));
  return d.finalSeverity * progress ** 1.5;
}

async function inject(app: FastifyInstance, request: InjectOptions): Promise<unknown> {
  // the process's own requests skip the rate limit, whatever KINESPEC_RATE_LIMIT_MAX says
  const response = await app.inject({ ...request, headers: { ...request.headers, 'x-kinespec-internal': app.internalToken } });
  if (response.statusCode >= 300) {
    throw new Error(`demo seeding: ${request.method} ${String(request.url)} answered ${response.statusCode}: ${response.body.slice(0, 300)}`);
  }
  return response.json();
}

export interface DemoOptions {
  adminKey: string;
  now?: Date;
  parallel?: number;
  /** Only these machines (model ids); default all (tests seed a part). */
  machines?: string[];
  /** Only these slots (0 = the oldest, 2 x 12 - 1 = the newest); default all. */
  slots?: number[];
}

/** The demo once its keys and machine models are in: the recordings still to push, and how to push them. */
export interface PreparedDemo {
  engineer: string;
  logger: string;
  /** recordings the run will push */
  total: number;
  /**
   * Pushes the recordings, oldest first per point, calling `onRecording` after each; stops early (between
   * recordings) once `stop` says so. Resolves with the number pushed.
   */
  run(onRecording?: (done: number) => void, stop?: () => boolean): Promise<number>;
}

/** Seeds the demo site through the HTTP API; returns the demo keys (shown once). */
export async function seedDemo(app: FastifyInstance, _sql: Sql, _siteId: string, options: DemoOptions): Promise<DemoKeys> {
  const demo = await prepareDemo(app, options);
  const recordings = await demo.run();
  return { engineer: demo.engineer, logger: demo.logger, recordings };
}

/** The quick part of the demo (its keys and machine models, a second or so), ready to push the recordings. */
export async function prepareDemo(app: FastifyInstance, options: DemoOptions): Promise<PreparedDemo> {
  const admin = { authorization: `Bearer ${options.adminKey}` };
  const engineer = (await inject(app, { method: 'POST', url: '/api/v1/keys', headers: admin, payload: { role: 'engineer', label: 'demo engineer' } })) as { key: string };
  const logger = (await inject(app, { method: 'POST', url: '/api/v1/keys', headers: admin, payload: { role: 'logger', label: 'demo logger' } })) as { key: string };
  const now = options.now ?? new Date();
  const start = new Date(now.getTime() - DEMO_WEEKS * WEEK_MS);

  const models: Array<{ demo: DemoMachine; model: MachineModel }> = [];
  for (const demo of demoMachines) {
    const text = readFileSync(machinesDir + demo.file, 'utf8');
    const model = loadMachineModel(text);
    if (options.machines && !options.machines.includes(model.id)) continue;
    await inject(app, {
      method: 'PUT',
      url: `/api/v1/machines/${model.id}/model?validFrom=${encodeURIComponent(start.toISOString())}`,
      headers: { ...admin, 'content-type': 'application/json' },
      payload: text,
    });
    models.push({ demo, model });
  }

  // one queue of recordings per point, oldest first; points run side by side so that every analysis thread works
  const allSlots = Array.from({ length: DEMO_WEEKS * DEMO_RECORDINGS_PER_WEEK }, (_, i) => i);
  const slots = options.slots ?? allSlots;
  const queues = models.flatMap(({ demo, model }, m) =>
    demo.points.map((pointId, p) => async (counted: () => void, stop?: () => boolean) => {
      for (const slot of slots) {
        if (stop?.()) return;
        const week = slot / DEMO_RECORDINGS_PER_WEEK;
        // the last slot lands an hour before now, the others spread evenly before it
        const recordedAt = new Date(start.getTime() + (slot + 1) * (WEEK_MS / DEMO_RECORDINGS_PER_WEEK) - 3_600_000);
        const speedRpm = Math.round(model.speed.nominalRpm * (1 - 0.004 * Math.sin(1.7 * slot + m)) * 10) / 10;
        const severity = demo.develops ? demoSeverity(demo.develops, week) : 0;
        const faults: SimulatedFault[] = demo.develops && severity > 0 ? [{ fault: demo.develops.fault, component: demo.develops.component, severity }] : [];
        const recording = simulateRecording(model, {
          pointId,
          sampleRateHz: DEMO_SAMPLE_RATE_HZ,
          sampleCount: DEMO_SAMPLE_COUNT,
          speedRpm,
          faults,
          seed: 1 + slot * 97 + m * 13 + p,
        });
        const vibration = { ...recording, channels: recording.channels.slice(0, 1) };
        const wav = Buffer.from(encodeWav(vibration, { format: 'float32' }));
        await inject(app, {
          method: 'POST',
          url: `/api/v1/machines/${model.id}/points/${pointId}/recordings?speedRpm=${speedRpm}`,
          headers: {
            authorization: `Bearer ${logger.key}`,
            'content-type': 'audio/wav',
            'idempotency-key': `demo:${model.id}:${pointId}:${slot}`,
            'x-recorded-at': recordedAt.toISOString(),
            // a logger set up for the point states the unit its channel is in
            'x-unit': vibration.channels[0]!.unit,
            // the demo's history is analysed as it is pushed, oldest first per point (RFC 7240 Prefer: wait)
            prefer: 'wait=120',
          },
          payload: wav,
        });
        counted();
      }
    }),
  );
  const parallel = Math.max(1, options.parallel ?? 3);
  return {
    engineer: engineer.key,
    logger: logger.key,
    total: queues.length * slots.length,
    async run(onRecording, stop) {
      let done = 0;
      const counted = () => {
        done += 1;
        onRecording?.(done);
      };
      let next = 0;
      await Promise.all(
        Array.from({ length: Math.min(parallel, queues.length) }, async () => {
          while (next < queues.length && !stop?.()) await queues[next++]!(counted, stop);
        }),
      );
      return done;
    },
  };
}
