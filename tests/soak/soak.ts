import { spawn, type ChildProcess } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import postgres from 'postgres';
import { encodeWav } from '../../packages/signal/src/index.js';
import { startPgCluster, type PgCluster } from '../support/pg-cluster.js';

/*
 * The soak: the scale-out topology of docker-compose.yml started as plain processes on this machine (two API
 * replicas with no analysis of their own, two `kinespec worker` processes, a PostgreSQL cluster of the run's
 * own on another port: never the machine's), bounded uploads on loopback at `ratePerS` for `seconds`, and in
 * the middle a PostgreSQL restart, a kill -9 of an API replica and of a worker (each started again). At the
 * end every acknowledged upload must be stored once with its SHA-256 and analysed. Prints throughput, p50/p99,
 * errors, recovery time and each process's peak RSS. Needs the built service (`npm run build`).
 *
 * `npm run soak` runs 10 minutes at twice a nominal plant's rate (SOAK_SECONDS, SOAK_RATE); CI runs 60 s
 * (tests/soak/soak.test.ts).
 */

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const cli = join(root, 'services/cli/bin/kinespec.js');
const MACHINE = 'skelmere-id-fan-1';
const POINT = 'fan-de-h';
const ADMIN_KEY = 'soak-admin-key-0123456789abcdefgh';

export interface SoakOptions {
  seconds: number;
  /** Uploads started per second (each with its own Idempotency-Key; one in ten also sent twice at once). */
  ratePerS: number;
  port: number;
  log?: (line: string) => void;
}

export interface SoakReport {
  acknowledged: number;
  found: number;
  duplicates: number;
  notAnalysed: number;
  sentTwiceAtOnce: number;
  statuses: Record<string, number>;
  p50Ms: number;
  p99Ms: number;
  throughputPerS: number;
  recoveryMs: { databaseRestart: number | null; apiKill: number | null };
  peakRssMb: Record<string, number>;
  /** Database bytes per stored recording (8,192 samples) by table, and trend rows per recording: the capacity note's inputs. */
  storage: { bytesPerRecording: Record<string, number>; trendRowsPerRecording: number };
}

export function serviceIsBuilt(): boolean {
  return existsSync(join(root, 'services/api/dist/index.js'));
}

interface Proc {
  name: string;
  child: ChildProcess;
  url?: string;
  peakRssMb: number;
}

function peakRss(pid: number | undefined): number {
  try {
    return Number(/VmHWM:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))?.[1] ?? 0) / 1024;
  } catch {
    return 0;
  }
}

function startProcess(name: string, verb: 'serve' | 'worker', env: Record<string, string>): Promise<Proc> {
  const child = spawn(process.execPath, [cli, verb, ...(verb === 'serve' ? ['--port', '0'] : [])], {
    env: { ...process.env, ...env, KINESPEC_LOG_LEVEL: 'error' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const proc: Proc = { name, child, peakRssMb: 0 };
  let out = '';
  child.stderr!.on('data', (chunk: Buffer) => {
    if (out.length < 4000) out += chunk.toString();
  });
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${name} did not start: ${out}`)), 90_000);
    child.stdout!.on('data', (chunk: Buffer) => {
      out += chunk.toString();
      const m = verb === 'serve' ? /listening on (http:\/\/\S+)/.exec(out) : /Kinespec worker: analysing/.exec(out);
      if (m) {
        clearTimeout(timer);
        if (verb === 'serve') proc.url = m[1];
        resolve(proc);
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`${name} exited with ${code}: ${out}`));
    });
  });
}

function sample(i: number): Buffer {
  // a unique small recording: 8,192 samples of two tones whose amplitudes depend on i
  const n = 8192;
  const x = new Float64Array(n);
  for (let k = 0; k < n; k++) x[k] = (1 + (i % 97) / 50) * Math.sin((2 * Math.PI * 159.2 * k) / 25_600) + 0.1 * Math.sin((2 * Math.PI * (300 + (i % 13)) * k) / 25_600);
  return Buffer.from(encodeWav({ sampleRateHz: 25_600, channels: [{ name: 'acc', unit: 'g', samples: x }], metadata: {} }, { format: 'float32' }));
}

export async function soak(options: SoakOptions): Promise<SoakReport> {
  const log = options.log ?? (() => {});
  let cluster: PgCluster | null = null;
  const procs: Proc[] = [];
  const statuses: Record<string, number> = {};
  const latencies: number[] = [];
  const acked = new Map<string, { hash: string; recordingId: string }>();
  let sentTwice = 0;
  try {
    cluster = startPgCluster(options.port);
    const env = { DATABASE_URL: cluster.url, KINESPEC_ADMIN_KEY: ADMIN_KEY, KINESPEC_DEMO: 'off', KINESPEC_RATE_LIMIT_MAX: '0', KINESPEC_DB_POOL_MAX: '5' };
    const apiEnv = { ...env, KINESPEC_QUEUE_WORKERS: '0', KINESPEC_ANALYSIS_THREADS: '0', KINESPEC_UPLOAD_WAIT_MS: '2000' };
    const workerEnv = { ...env, KINESPEC_QUEUE_WORKERS: '1', KINESPEC_ANALYSIS_THREADS: '1' };
    procs.push(await startProcess('api-1', 'serve', apiEnv));
    procs.push(await startProcess('api-2', 'serve', apiEnv), await startProcess('worker-1', 'worker', workerEnv), await startProcess('worker-2', 'worker', workerEnv));
    const apis = () => procs.filter((p) => p.name.startsWith('api') && p.url);
    const headers = { authorization: `Bearer ${ADMIN_KEY}` };
    const modelText = readFileSync(join(root, `fixtures/machines/${MACHINE}.json`), 'utf8');
    const put = await fetch(`${apis()[0]!.url}/api/v1/machines/${MACHINE}/model`, { method: 'PUT', headers: { ...headers, 'content-type': 'application/json' }, body: modelText });
    if (!put.ok) throw new Error(`PUT model answered ${put.status}`);
    log(`soak: 2 API replicas, 2 workers, PostgreSQL on ${options.port}; ${options.ratePerS} uploads/s for ${options.seconds} s`);

    let lastSuccessAt = 0;
    async function uploadWithRetry(i: number, body: Buffer, key: string): Promise<void> {
      const hash = createHash('sha256').update(body).digest('hex');
      const deadline = Date.now() + 120_000;
      for (let attempt = 0; Date.now() < deadline; attempt++) {
        const api = apis()[(i + attempt) % Math.max(1, apis().length)];
        if (!api) {
          await new Promise((r) => setTimeout(r, 200));
          continue;
        }
        const t0 = performance.now();
        try {
          const res = await fetch(`${api.url}/api/v1/machines/${MACHINE}/points/${POINT}/recordings`, {
            method: 'POST', headers: { ...headers, 'content-type': 'audio/wav', 'idempotency-key': key }, body, signal: AbortSignal.timeout(30_000),
          });
          const text = await res.text();
          latencies.push(performance.now() - t0);
          statuses[res.status] = (statuses[res.status] ?? 0) + 1;
          if (res.ok) {
            const recordingId = (JSON.parse(text) as { recordingId: string }).recordingId;
            const earlier = acked.get(key);
            if (earlier && earlier.recordingId !== recordingId) throw new Error(`key ${key} acknowledged as two recordings`);
            acked.set(key, { hash, recordingId });
            lastSuccessAt = Date.now();
            return;
          }
          if (res.status !== 503 && res.status !== 429 && res.status < 500) throw new Error(`upload ${key} answered ${res.status}: ${text.slice(0, 200)}`);
          const after = Number(res.headers.get('retry-after') ?? 1);
          await new Promise((r) => setTimeout(r, Math.min(after, 5) * 1000 * (0.5 + Math.random() / 2)));
        } catch (err) {
          if (err instanceof Error && /answered|acknowledged/.test(err.message)) throw err;
          statuses['network'] = (statuses['network'] ?? 0) + 1;
          await new Promise((r) => setTimeout(r, 300 + Math.random() * 500));
        }
      }
      throw new Error(`upload ${key} not acknowledged within 120 s`);
    }

    const started = Date.now();
    const inFlight: Promise<void>[] = [];
    const recovery: SoakReport['recoveryMs'] = { databaseRestart: null, apiKill: null };
    const chaos = [
      { at: 0.3, run: async () => {
        log('chaos: PostgreSQL restart');
        cluster!.stop('fast');
        await new Promise((r) => setTimeout(r, 1_000));
        cluster!.start();
        const back = Date.now();
        const before = lastSuccessAt;
        while (lastSuccessAt <= back && Date.now() - back < 60_000) await new Promise((r) => setTimeout(r, 50));
        recovery.databaseRestart = lastSuccessAt > before ? lastSuccessAt - back : null;
      } },
      { at: 0.5, run: async () => {
        log('chaos: kill -9 of api-1');
        const victim = procs.find((p) => p.name === 'api-1')!;
        victim.peakRssMb = Math.max(victim.peakRssMb, peakRss(victim.child.pid));
        victim.child.kill('SIGKILL');
        victim.url = undefined;
        const t = Date.now();
        const fresh = await startProcess('api-1', 'serve', apiEnv);
        fresh.peakRssMb = victim.peakRssMb;
        procs[procs.indexOf(victim)] = fresh;
        recovery.apiKill = Date.now() - t;
      } },
      { at: 0.7, run: async () => {
        log('chaos: kill -9 of worker-1');
        const victim = procs.find((p) => p.name === 'worker-1')!;
        victim.peakRssMb = Math.max(victim.peakRssMb, peakRss(victim.child.pid));
        victim.child.kill('SIGKILL');
        const fresh = await startProcess('worker-1', 'worker', workerEnv);
        fresh.peakRssMb = victim.peakRssMb;
        procs[procs.indexOf(victim)] = fresh;
      } },
    ];
    const chaosRuns: Promise<void>[] = [];
    let i = 0;
    while (Date.now() - started < options.seconds * 1000) {
      const elapsed = (Date.now() - started) / (options.seconds * 1000);
      while (chaos.length > 0 && chaos[0]!.at <= elapsed) chaosRuns.push(chaos.shift()!.run());
      const body = sample(i);
      const key = `soak-${i}`;
      inFlight.push(uploadWithRetry(i, body, key));
      if (i % 10 === 5) {
        // a logger's retry racing its first try: the same key at once
        sentTwice++;
        inFlight.push(uploadWithRetry(i + 1, body, key));
      }
      i++;
      for (const p of procs) p.peakRssMb = Math.max(p.peakRssMb, peakRss(p.child.pid));
      const next = started + (i * 1000) / options.ratePerS;
      await new Promise((r) => setTimeout(r, Math.max(0, next - Date.now())));
    }
    await Promise.all(chaosRuns);
    await Promise.all(inFlight);
    const elapsedS = (Date.now() - started) / 1000;

    // every acknowledged upload: stored once with its hash, analysed (workers drain the queue within 120 s)
    const sql = postgres(cluster.url, { max: 1, onnotice: () => {} });
    let notAnalysed = 0;
    let found = 0;
    let duplicates = 0;
    let storage: SoakReport['storage'] = { bytesPerRecording: {}, trendRowsPerRecording: 0 };
    try {
      const drainUntil = Date.now() + 120_000;
      for (;;) {
        const [row] = await sql<{ n: number }[]>`select count(*)::int as n from recordings where analysis_state = 'queued'`;
        if (row!.n === 0 || Date.now() > drainUntil) break;
        await new Promise((r) => setTimeout(r, 500));
      }
      const rows = await sql<{ key: string; id: string; hash: string; state: string; n: number }[]>`
        select idempotency_key as key, min(id::text) as id, encode((array_agg(content_hash))[1], 'hex') as hash, min(analysis_state) as state,
          count(*)::int as n
        from recordings where idempotency_key like 'soak-%' group by idempotency_key`;
      const byKey = new Map(rows.map((r) => [r.key, r]));
      for (const [key, a] of acked) {
        const r = byKey.get(key);
        if (!r || r.hash !== a.hash || r.id !== a.recordingId) continue;
        found++;
        if (r.state !== 'done') notAnalysed++;
      }
      duplicates = rows.filter((r) => r.n > 1).length;
      const [current] = await sql<{ n: number }[]>`
        select count(*)::int as n from (select recording_id from analyses where is_current group by recording_id having count(*) > 1) x`;
      duplicates += current!.n;
      const [count] = await sql<{ n: number; trends: number }[]>`
        select (select count(*)::int from recordings) as n, (select count(*)::int from trend_values) as trends`;
      // a partitioned table (trend_values) holds nothing itself: its size is its partitions'; pg_partition_tree lists
      // no row for a table outside any partition tree, whose size is its own
      const sizes = await sql<{ name: string; bytes: number }[]>`
        select t as name, coalesce(
          (select sum(pg_total_relation_size(p.relid)) from pg_partition_tree(t::regclass) p),
          pg_total_relation_size(t::regclass))::float8 as bytes
        from unnest(array['recordings', 'analyses', 'trend_values', 'trend_daily']) as t`;
      storage = {
        bytesPerRecording: Object.fromEntries(sizes.map((z) => [z.name, Math.round(z.bytes / Math.max(1, count!.n))])),
        trendRowsPerRecording: count!.trends / Math.max(1, count!.n),
      };
    } finally {
      await sql.end();
    }
    for (const p of procs) p.peakRssMb = Math.max(p.peakRssMb, peakRss(p.child.pid));
    const sorted = [...latencies].sort((a, b) => a - b);
    const pct = (q: number) => sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))] ?? NaN;
    return {
      acknowledged: acked.size,
      found,
      duplicates,
      notAnalysed,
      sentTwiceAtOnce: sentTwice,
      statuses,
      p50Ms: pct(0.5),
      p99Ms: pct(0.99),
      throughputPerS: acked.size / elapsedS,
      recoveryMs: recovery,
      peakRssMb: Object.fromEntries(procs.map((p) => [p.name, Math.round(p.peakRssMb)])),
      storage,
    };
  } finally {
    for (const p of procs) p.child.kill('SIGKILL');
    cluster?.destroy();
  }
}

export function formatReport(r: SoakReport): string {
  return [
    `acknowledged ${r.acknowledged}, found by hash ${r.found}, duplicates ${r.duplicates}, not analysed ${r.notAnalysed} (${r.sentTwiceAtOnce} keys sent twice at once)`,
    `throughput ${r.throughputPerS.toFixed(1)} acknowledged uploads/s; latency p50 ${r.p50Ms.toFixed(0)} ms, p99 ${r.p99Ms.toFixed(0)} ms`,
    `answers ${Object.entries(r.statuses).map(([k, v]) => `${k}: ${v}`).join(', ')}`,
    `recovery: first upload stored ${r.recoveryMs.databaseRestart ?? '-'} ms after PostgreSQL was back; api-1 serving again ${r.recoveryMs.apiKill ?? '-'} ms after its kill -9`,
    `peak RSS (MB): ${Object.entries(r.peakRssMb).map(([k, v]) => `${k} ${v}`).join(', ')}`,
    `storage per recording of 8,192 samples (bytes): ${Object.entries(r.storage.bytesPerRecording).map(([k, v]) => `${k} ${v}`).join(', ')}; ${r.storage.trendRowsPerRecording.toFixed(1)} trend rows`,
  ].join('\n');
}

if (import.meta.url === `file://${process.argv[1]}`) {
  if (!serviceIsBuilt()) {
    console.log('soak skipped: the service is not built (npm run build)');
  } else {
    const report = await soak({
      seconds: Number(process.env.SOAK_SECONDS ?? 600),
      ratePerS: Number(process.env.SOAK_RATE ?? 4),
      port: Number(process.env.SOAK_PG_PORT ?? 55_490),
      log: (line) => console.log(line),
    });
    console.log(formatReport(report));
    if (report.found !== report.acknowledged || report.duplicates > 0 || report.notAnalysed > 0) process.exitCode = 1;
  }
}
