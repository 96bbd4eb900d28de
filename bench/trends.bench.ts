// Trend query latency on a year of hourly recordings for a fleet of 1,000 machines, on the PostgreSQL
// server (BENCH_DATABASE_URL, default postgres://postgres@127.0.0.1:5432/postgres; a scratch database is
// created and dropped). The data are made server-side with generate_series. Prints p50/p95; asserts nothing.
//
//   FLEET_MACHINES (default 1000)  machines, one vibration point each
//   TREND_MACHINES (default 250)   of those, how many get the full hourly series in trend_values
//                                  (the daily roll-up is made for every machine either way). The
//                                  default keeps this file under a minute; TREND_MACHINES=1000 takes
//                                  about 80 s to generate 8.76 million values on 2 cores.
//
// The scratch database drops the foreign key from trend_values to recordings, so the hourly values can be
// generated without also generating 8.76 million recordings with their samples; no measured query reads
// recordings. Everything else is the service's own schema (migrations/) and queries (services/api/src/store.ts).
import postgres from 'postgres';
import { migrate } from '../services/api/src/migrate.js';
import { fleetRanking, trendBuckets, weeklySparklines, type Bucket } from '../services/api/src/store.js';

const baseUrl = process.env.BENCH_DATABASE_URL ?? 'postgres://postgres@127.0.0.1:5432/postgres';
const MACHINES = Number(process.env.FLEET_MACHINES ?? 1000);
const WITH_SERIES = Math.min(MACHINES, Number(process.env.TREND_MACHINES ?? 250));
const HOURS = 365 * 24;
const END = new Date(Date.UTC(2025, 11, 31, 23, 0, 0));
const START = new Date(END.getTime() - (HOURS - 1) * 3_600_000);
// the bench's values belong to no stored recording (see above); one fixed id keeps generation quick
const NO_RECORDING = '00000000-0000-0000-0000-000000000000';

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(p * sorted.length))]!;
}

async function measure(label: string, runs: number, f: (i: number) => Promise<unknown>): Promise<void> {
  for (let i = 0; i < 5; i++) await f(i); // warm-up: plans, caches
  const ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await f(i);
    ms.push(performance.now() - t0);
  }
  ms.sort((a, b) => a - b);
  console.log(`${label.padEnd(58)} p50 ${percentile(ms, 0.5).toFixed(2).padStart(7)} ms   p95 ${percentile(ms, 0.95).toFixed(2).padStart(7)} ms   (${runs} runs)`);
}

async function main(): Promise<void> {
  const admin = postgres(baseUrl, { max: 1, onnotice: () => {} });
  try {
    await admin`select 1`;
  } catch (err) {
    console.log(`trends bench skipped: no PostgreSQL at ${baseUrl} (${(err as Error).message})`);
    await admin.end();
    return;
  }
  const name = `kinespec_bench_trends_${Date.now()}`;
  await admin.unsafe(`create database ${name}`);
  const url = new URL(baseUrl);
  url.pathname = `/${name}`;
  const sql = postgres(url.toString(), { max: 4, onnotice: () => {}, connection: { TimeZone: 'UTC' } });
  try {
    await migrate(sql);
    await sql`alter table trend_values drop constraint trend_values_recording_id_fkey`;
    const t0 = performance.now();
    const [site] = await sql<{ id: string }[]>`insert into sites (name) values ('bench fleet') returning id`;
    await sql`insert into machines (site_id, machine_key, name, current_model_version)
      select ${site!.id}, 'machine-' || lpad(i::text, 4, '0'), 'Machine ' || i, 1 from generate_series(1, ${MACHINES}) as i`;
    await sql`insert into points (machine_id, point_key, quantity, unit, iso_group, iso_foundation)
      select id, 'de-h', 'acceleration', 'g', 2, 'rigid' from machines`;
    // the indexes are built after the bulk insert (as a restore would), then the tables analysed
    await sql`drop index trend_values_series`;
    await sql`drop index trend_values_recording`;
    await sql`drop index trend_daily_window`;
    // hourly overall velocity: a slow drift per machine, a daily swing and some noise
    await sql`
      insert into trend_values (point_id, indicator, recorded_at, recording_id, analysis_id, value)
      select p.id, 'velocity_rms_mm_per_s', t, ${NO_RECORDING}::uuid, ${NO_RECORDING}::uuid,
        1.0 + (p.id % 7) * 0.2 + 0.5 * extract(epoch from t - ${START}) / ${HOURS * 3600}
          + 0.1 * sin(extract(epoch from t) / 86400.0 * 2 * pi()) + 0.05 * random()
      from points p
      cross join generate_series(${START}::timestamptz, ${END}::timestamptz, interval '1 hour') as t
      where p.id <= ${WITH_SERIES}`;
    const tValues = performance.now();
    await sql`create unique index trend_values_series on trend_values (point_id, indicator, recorded_at, recording_id) include (value)`;
    await sql`create index trend_values_recording on trend_values (recording_id)`;
    const tIndex = performance.now();
    // the daily roll-up of every machine (24 values a day), as the ingest keeps it
    await sql`
      insert into trend_daily (point_id, indicator, day, count, sum, min, max, last_value, last_at)
      select p.id, 'velocity_rms_mm_per_s', d::date, 24, 24 * v, v - 0.1, v + 0.1, v, d + interval '23 hours'
      from points p
      cross join generate_series(${START}::timestamptz, ${END}::timestamptz, interval '1 day') as d
      cross join lateral (select 1.0 + (p.id % 7) * 0.2 + 0.5 * extract(epoch from d - ${START}) / ${HOURS * 3600} as v) x`;
    await sql`create index trend_daily_window on trend_daily (indicator, day, point_id) include (sum, count)`;
    await sql`vacuum analyze`;
    const [counts] = await sql<{ values: number; daily: number }[]>`
      select (select count(*)::int from trend_values) as values, (select count(*)::int from trend_daily) as daily`;
    console.log(
      `data: ${MACHINES} machines, ${WITH_SERIES} with hourly series: ${counts!.values.toLocaleString('en')} trend values ` +
        `(${((tValues - t0) / 1000).toFixed(1)} s to generate, ${((tIndex - tValues) / 1000).toFixed(1)} s to index), ${counts!.daily.toLocaleString('en')} daily roll-up rows; ` +
        `ready in ${((performance.now() - t0) / 1000).toFixed(1)} s`,
    );
    if (WITH_SERIES < MACHINES) console.log(`(hourly series for ${WITH_SERIES} of ${MACHINES} machines: a stated fraction)`);

    const pointIds = (await sql<{ id: number }[]>`select id from points where id <= ${WITH_SERIES} order by id`).map((r) => r.id);
    const pick = (i: number) => pointIds[(i * 7919) % pointIds.length]!;
    const series = (bucket: Bucket, days: number) => (i: number) =>
      trendBuckets(sql, {
        pointId: pick(i),
        indicator: 'velocity_rms_mm_per_s',
        bucket,
        from: new Date(END.getTime() - days * 86_400_000),
        to: new Date(END.getTime() + 3_600_000),
      });
    await measure('trend, one point, a year by ISO week (8,760 values)', 200, series('week', 365));
    await measure('trend, one point, a year by month', 200, series('month', 365));
    await measure('trend, one point, 90 days by day (2,160 values)', 200, series('day', 90));
    await measure('trend, one point, 4 weeks by day', 200, series('day', 28));
    await measure(`fleet ranking, ${MACHINES} machines, last 4 weeks`, 50, () =>
      fleetRanking(sql, { siteId: site!.id, indicators: ['velocity_rms_mm_per_s'], weeks: 4, asOf: END, limit: 20 }));
    await measure(`fleet ranking, ${MACHINES} machines, last 12 weeks`, 50, () =>
      fleetRanking(sql, { siteId: site!.id, indicators: ['velocity_rms_mm_per_s'], weeks: 12, asOf: END, limit: 20 }));
    await measure(`machine list sparklines, ${MACHINES} machines, 12 weeks`, 20, () =>
      weeklySparklines(sql, { siteId: site!.id, indicator: 'velocity_rms_mm_per_s', from: new Date(END.getTime() - 84 * 86_400_000) }));
  } finally {
    await sql.end();
    await admin.unsafe(`drop database if exists ${name} with (force)`);
    await admin.end();
  }
}

await main();
