import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Database } from '../../services/api/src/database.js';
import { migrate, pendingMigrations, readMigrations } from '../../services/api/src/migrate.js';
import { packSamples, unpackSamples } from '../../services/api/src/samples-codec.js';
import {
  createSite,
  fleetRanking,
  getCurrentAnalysis,
  insertAnalysis,
  insertRecording,
  listAnalyses,
  listIndicators,
  putMachineModel,
  trendBuckets,
  writeTrendValues,
  type PointSpec,
} from '../../services/api/src/store.js';
import { targets } from './harness.js';

/*
 * The store suite: the same migrations and queries on embedded PGlite and, when TEST_DATABASE_URL is
 * set, on the PostgreSQL server. Values are put in directly so that every expected bucket can be
 * computed by hand.
 */

const point = (key: string): PointSpec => ({
  pointKey: key, quantity: 'acceleration', unit: 'g', near: null, shaft: null, direction: null,
  alarmVelocityRmsMmPerS: null, tripVelocityRmsMmPerS: null, baselineVelocityRmsMmPerS: null, isoGroup: 2, isoFoundation: 'rigid',
});

for (const target of targets) {
  describe(`store on ${target.name}`, () => {
    let db: Database & { drop(): Promise<void> };
    let siteId: string;
    let pointId: number;
    let otherPointId: number;

    async function record(p: number, at: string, indicators: Record<string, number>): Promise<string> {
      const recordedAt = new Date(at);
      return db.sql.begin(async (tx) => {
        const id = await insertRecording(tx, {
          siteId, pointId: p, recordedAt, sampleRateHz: 1000, sampleCount: 2,
          channels: [{ name: 'a', unit: 'g' }], samples: packSamples([[0, 1]]), contentHash: Buffer.from(at + p),
          idempotencyKey: null, sourceFormat: 'test', speedRpm: null, metadata: {}, uploadedBy: null,
        });
        const a = await insertAnalysis(tx, {
          recordingId: id, modelVersion: 1, softwareVersion: 'test', speedHz: null, speedSource: null,
          velocityRmsMmPerS: indicators['velocity_rms_mm_per_s'] ?? null, zone: null, alarmState: null, alarmLevelMmPerS: null, tripLevelMmPerS: null, topHypothesis: null, resultJson: JSON.stringify({ indicators }),
        });
        await writeTrendValues(tx, { pointId: p, recordingId: id, analysisId: a.id, recordedAt, indicators });
        return id;
      });
    }

    beforeAll(async () => {
      db = await target.open();
      expect(await migrate(db.sql)).toEqual(readMigrations().map((m) => m.name));
      siteId = (await createSite(db.sql, 'store test')).id;
      await db.sql.begin((tx) =>
        putMachineModel(tx, { siteId, machineKey: 'm1', name: 'M1', model: { id: 'm1' }, sourceText: '{}', points: [point('p1'), point('p2')], createdBy: null }),
      );
      const rows = await db.sql<{ id: number; point_key: string }[]>`select id, point_key from points order by point_key`;
      pointId = rows[0]!.id;
      otherPointId = rows[1]!.id;
    });
    afterAll(async () => db?.drop());

    it('applies every migration once and reports none pending', async () => {
      expect(await migrate(db.sql)).toEqual([]);
      expect(await pendingMigrations(db.sql)).toEqual([]);
    });

    it('refuses to start when an applied migration file was edited', async () => {
      const [first] = readMigrations();
      await expect(migrate(db.sql, [{ ...first!, checksum: 'edited' }])).rejects.toThrow(/was changed after it was applied/);
    });

    it('keeps raw samples as float32 bytes and gives them back exactly', () => {
      const x = [0.1, -2.5, 3e-7];
      const back = unpackSamples(packSamples([x, [1, 2, 3]]), 2);
      // float32 rounding of each value is what Math.fround gives (IEEE 754 binary32)
      expect(Array.from(back[0]!)).toEqual(x.map(Math.fround));
      expect(Array.from(back[1]!)).toEqual([1, 2, 3]);
    });

    it('buckets trend values by day, ISO week and month as computed by hand', async () => {
      // 2024-01-01 is a Monday; 2024-01-07 the Sunday of the same ISO week (ISO 8601: weeks begin on Monday)
      await record(pointId, '2024-01-01T06:00:00Z', { velocity_rms_mm_per_s: 1.0 });
      await record(pointId, '2024-01-01T18:00:00Z', { velocity_rms_mm_per_s: 3.0 });
      await record(pointId, '2024-01-07T23:59:00Z', { velocity_rms_mm_per_s: 2.0 });
      await record(pointId, '2024-01-08T00:01:00Z', { velocity_rms_mm_per_s: 5.0 });
      await record(pointId, '2024-02-01T12:00:00Z', { velocity_rms_mm_per_s: 4.0 });
      const range = { pointId, indicator: 'velocity_rms_mm_per_s', from: new Date('2024-01-01T00:00:00Z'), to: new Date('2024-03-01T00:00:00Z') };

      const days = await trendBuckets(db.sql, { ...range, bucket: 'day' });
      expect(days.map((b) => [b.start.toISOString().slice(0, 10), b.count, b.min, b.mean, b.max, b.last])).toEqual([
        ['2024-01-01', 2, 1, 2, 3, 3], // (1 + 3) / 2 = 2, last = the 18:00 value
        ['2024-01-07', 1, 2, 2, 2, 2],
        ['2024-01-08', 1, 5, 5, 5, 5],
        ['2024-02-01', 1, 4, 4, 4, 4],
      ]);
      const weeks = await trendBuckets(db.sql, { ...range, bucket: 'week' });
      expect(weeks.map((b) => [b.start.toISOString().slice(0, 10), b.count, b.min, b.mean, b.max, b.last])).toEqual([
        ['2024-01-01', 3, 1, 2, 3, 2], // Mon 1 Jan .. Sun 7 Jan: (1 + 3 + 2) / 3 = 2, last = Sunday's 2
        ['2024-01-08', 1, 5, 5, 5, 5],
        ['2024-01-29', 1, 4, 4, 4, 4], // 1 Feb 2024 is a Thursday; its ISO week began Monday 29 Jan
      ]);
      const months = await trendBuckets(db.sql, { ...range, bucket: 'month' });
      expect(months.map((b) => [b.start.toISOString().slice(0, 10), b.count, b.min, b.mean, b.max, b.last])).toEqual([
        ['2024-01-01', 4, 1, 2.75, 5, 5], // (1 + 3 + 2 + 5) / 4 = 2.75
        ['2024-02-01', 1, 4, 4, 4, 4],
      ]);
      // [from, to) is half-open: a value at `to` is left out
      const cut = await trendBuckets(db.sql, { ...range, to: new Date('2024-01-08T00:01:00Z'), bucket: 'month' });
      expect(cut.map((b) => b.count)).toEqual([3]);
    });

    it('counts indicators from the daily roll-up', async () => {
      const rows = await listIndicators(db.sql, { machineId: 0, pointId });
      expect(rows).toEqual([{ pointId, indicator: 'velocity_rms_mm_per_s', count: 5 }]);
    });

    it('ranks points by the rise between two seven-day windows, computed by hand', async () => {
      // p1: days 1-7 Mar mean 2, days 22-28 Mar mean 3 (+50 %); p2: 4 then 5 (+25 %); weeks = 3
      await record(pointId, '2024-03-02T00:00:00Z', { velocity_rms_mm_per_s: 1 });
      await record(pointId, '2024-03-05T00:00:00Z', { velocity_rms_mm_per_s: 3 });
      await record(pointId, '2024-03-25T00:00:00Z', { velocity_rms_mm_per_s: 3 });
      await record(otherPointId, '2024-03-03T00:00:00Z', { velocity_rms_mm_per_s: 4 });
      await record(otherPointId, '2024-03-27T00:00:00Z', { velocity_rms_mm_per_s: 5 });
      const rows = await fleetRanking(db.sql, { siteId, indicators: ['velocity_rms_mm_per_s'], weeks: 3, asOf: new Date('2024-03-28T12:00:00Z'), limit: 10 });
      // one row per machine: its point with the largest relative rise
      expect(rows).toEqual([{ machineKey: 'm1', pointKey: 'p1', indicator: 'velocity_rms_mm_per_s', before: 2, after: 3, rise: 1, risePercent: 50 }]);
    });

    it('keeps every analysis of a recording and marks only the newest current', async () => {
      const id = await record(pointId, '2024-04-01T00:00:00Z', { velocity_rms_mm_per_s: 1, kurtosis: 3 });
      const second = await db.sql.begin(async (tx) => {
        const a = await insertAnalysis(tx, {
          recordingId: id, modelVersion: 2, softwareVersion: 'test-2', speedHz: null, speedSource: null,
          velocityRmsMmPerS: 1.5, zone: null, alarmState: null, alarmLevelMmPerS: null, tripLevelMmPerS: null, topHypothesis: null, resultJson: JSON.stringify({ indicators: { velocity_rms_mm_per_s: 1.5 } }),
        });
        await writeTrendValues(tx, { pointId, recordingId: id, analysisId: a.id, recordedAt: new Date('2024-04-01T00:00:00Z'), indicators: { velocity_rms_mm_per_s: 1.5 } });
        return a;
      });
      const all = await listAnalyses(db.sql, id);
      expect(all.map((a) => [a.modelVersion, a.softwareVersion, a.current])).toEqual([[1, 'test', false], [2, 'test-2', true]]);
      expect((await getCurrentAnalysis(db.sql, id))!.id).toBe(second.id);
      // the trend now holds the new value only, and the day's roll-up was recomputed (kurtosis gone)
      const day = await trendBuckets(db.sql, { pointId, indicator: 'velocity_rms_mm_per_s', bucket: 'day', from: new Date('2024-04-01T00:00:00Z'), to: new Date('2024-04-02T00:00:00Z') });
      expect(day.map((b) => [b.count, b.mean])).toEqual([[1, 1.5]]);
      const daily = await db.sql<{ indicator: string; count: number; sum: number }[]>`
        select indicator, count, sum from trend_daily where point_id = ${pointId} and day = '2024-04-01'`;
      expect(daily).toEqual([{ indicator: 'velocity_rms_mm_per_s', count: 1, sum: 1.5 }]);
    });
  });
}
