import type { Queryable, Sql } from './database.js';

/*
 * Every query of the service, in one module: postgres.js tagged templates, so every value is a
 * bound parameter. Functions take a pool or a transaction (Queryable); the caller decides where a
 * transaction starts. Rows come back in the API's own field names.
 */

type Json = Parameters<Queryable['json']>[0];
const json = (sql: Queryable, value: unknown) => sql.json(value as Json);

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
/** A malformed id cannot name a row: callers answer 404 instead of letting PostgreSQL reject the cast. */
export function isUuid(id: string): boolean {
  return UUID.test(id);
}

// ---------------------------------------------------------------- sites and keys

export type Role = 'logger' | 'engineer' | 'admin' | 'platform';

export interface ApiKeyRow {
  id: string;
  siteId: string;
  role: Role;
  label: string;
}

export async function createSite(sql: Queryable, name: string): Promise<{ id: string; name: string }> {
  const [row] = await sql<{ id: string; name: string }[]>`insert into sites (name) values (${name}) returning id, name`;
  return row!;
}

export async function getSite(sql: Queryable, siteId: string): Promise<{ id: string; name: string } | null> {
  const [row] = await sql<{ id: string; name: string }[]>`select id, name from sites where id = ${siteId}`;
  return row ?? null;
}

export async function countSites(sql: Queryable): Promise<number> {
  const [row] = await sql<{ n: number }[]>`select count(*)::int as n from sites`;
  return row!.n;
}

export async function firstSite(sql: Queryable): Promise<{ id: string; name: string } | null> {
  const [row] = await sql<{ id: string; name: string }[]>`select id, name from sites order by created_at, id limit 1`;
  return row ?? null;
}

export async function insertApiKey(
  sql: Queryable,
  key: { siteId: string; role: Role; label: string; keyHash: Buffer },
): Promise<ApiKeyRow> {
  const [row] = await sql<ApiKeyRow[]>`
    insert into api_keys (site_id, role, label, key_hash)
    values (${key.siteId}, ${key.role}, ${key.label}, ${key.keyHash})
    on conflict (key_hash) do update set key_hash = excluded.key_hash
    returning id, site_id as "siteId", role, label`;
  return row!;
}

export interface ApiKeyListRow extends ApiKeyRow {
  createdAt: Date;
  lastUsedAt: Date | null;
  revokedAt: Date | null;
  replacedBy: string | null;
}

/** Every key of a site (never another's), newest first; the hashes stay in the store. */
export async function listApiKeys(sql: Queryable, siteId: string): Promise<ApiKeyListRow[]> {
  return sql<ApiKeyListRow[]>`
    select id, site_id as "siteId", role, label, created_at as "createdAt", last_used_at as "lastUsedAt",
      revoked_at as "revokedAt", replaced_by as "replacedBy"
    from api_keys where site_id = ${siteId} order by created_at desc, id`;
}

/** Revokes a key of the site; null when the site has no such key. Revoking again keeps the first time. */
export async function revokeApiKey(sql: Queryable, siteId: string, keyId: string, replacedBy: string | null = null): Promise<ApiKeyListRow | null> {
  if (!isUuid(keyId)) return null;
  const [row] = await sql<ApiKeyListRow[]>`
    update api_keys set revoked_at = coalesce(revoked_at, now()), replaced_by = coalesce(${replacedBy}, replaced_by)
    where id = ${keyId} and site_id = ${siteId}
    returning id, site_id as "siteId", role, label, created_at as "createdAt", last_used_at as "lastUsedAt",
      revoked_at as "revokedAt", replaced_by as "replacedBy"`;
  return row ?? null;
}

/** Notes that a key was used; written at most once a minute per key so that busy loggers cost no writes. */
export async function touchApiKey(sql: Queryable, keyId: string): Promise<void> {
  await sql`
    update api_keys set last_used_at = now()
    where id = ${keyId} and (last_used_at is null or last_used_at < now() - interval '1 minute')`;
}

export async function findApiKey(sql: Queryable, keyHash: Buffer): Promise<ApiKeyRow | null> {
  const [row] = await sql<ApiKeyRow[]>`
    select id, site_id as "siteId", role, label from api_keys where key_hash = ${keyHash} and revoked_at is null`;
  return row ?? null;
}

// ---------------------------------------------------------------- machines, models, points

export interface MachineRow {
  id: number;
  siteId: string;
  machineKey: string;
  name: string;
  currentModelVersion: number | null;
}

export interface PointRow {
  id: number;
  machineId: number;
  pointKey: string;
  quantity: string;
  unit: string | null;
  near: string | null;
  shaft: string | null;
  direction: string | null;
  alarmVelocityRmsMmPerS: number | null;
  tripVelocityRmsMmPerS: number | null;
  baselineVelocityRmsMmPerS: number | null;
  isoGroup: 1 | 2 | null;
  isoFoundation: 'rigid' | 'flexible' | null;
  retiredAt: Date | null;
}

/** What the store keeps of one measurement point of a model version. */
export interface PointSpec {
  pointKey: string;
  quantity: string;
  unit: string | null;
  near: string | null;
  shaft: string | null;
  direction: string | null;
  alarmVelocityRmsMmPerS: number | null;
  tripVelocityRmsMmPerS: number | null;
  baselineVelocityRmsMmPerS: number | null;
  isoGroup: number | null;
  isoFoundation: string | null;
}

const machineColumns = (sql: Queryable) => sql`
  id, site_id as "siteId", machine_key as "machineKey", name, current_model_version as "currentModelVersion"`;

const pointColumns = (sql: Queryable) => sql`
  id, machine_id as "machineId", point_key as "pointKey", quantity, unit, near, shaft, direction,
  alarm_velocity_rms_mm_per_s as "alarmVelocityRmsMmPerS", trip_velocity_rms_mm_per_s as "tripVelocityRmsMmPerS",
  baseline_velocity_rms_mm_per_s as "baselineVelocityRmsMmPerS", iso_group as "isoGroup",
  iso_foundation as "isoFoundation", retired_at as "retiredAt"`;

export async function findMachine(sql: Queryable, siteId: string, machineKey: string): Promise<MachineRow | null> {
  const [row] = await sql<MachineRow[]>`
    select ${machineColumns(sql)} from machines where site_id = ${siteId} and machine_key = ${machineKey}`;
  return row ?? null;
}

export async function listMachineRows(sql: Queryable, siteId: string): Promise<MachineRow[]> {
  return sql<MachineRow[]>`select ${machineColumns(sql)} from machines where site_id = ${siteId} order by machine_key`;
}

/**
 * Stores a new model version of a machine (creating the machine on its first version), makes it
 * current and brings the points in line: new points are added, changed ones updated, points the new
 * version no longer lists are retired (their history stays). Call inside a transaction.
 */
export async function putMachineModel(
  tx: Queryable,
  input: {
    siteId: string;
    machineKey: string;
    name: string;
    model: unknown;
    sourceText: string;
    points: PointSpec[];
    createdBy: string | null;
    validFrom?: Date;
  },
): Promise<{ machineId: number; version: number }> {
  const [machine] = await tx<{ id: number }[]>`
    insert into machines (site_id, machine_key, name) values (${input.siteId}, ${input.machineKey}, ${input.name})
    on conflict (site_id, machine_key) do update set name = excluded.name
    returning id`;
  const machineId = machine!.id;
  // the row lock taken above serialises two uploads of one machine's model
  const [next] = await tx<{ version: number }[]>`
    select coalesce(max(version), 0) + 1 as version from machine_models where machine_id = ${machineId}`;
  const version = next!.version;
  await tx`
    insert into machine_models (machine_id, version, model, source_text, created_by, valid_from)
    values (${machineId}, ${version}, ${json(tx, input.model)}, ${input.sourceText}, ${input.createdBy},
            ${input.validFrom ?? new Date()})`;
  await tx`update machines set current_model_version = ${version} where id = ${machineId}`;
  for (const p of input.points) {
    await tx`
      insert into points (machine_id, point_key, quantity, unit, near, shaft, direction,
        alarm_velocity_rms_mm_per_s, trip_velocity_rms_mm_per_s, baseline_velocity_rms_mm_per_s, iso_group, iso_foundation)
      values (${machineId}, ${p.pointKey}, ${p.quantity}, ${p.unit}, ${p.near}, ${p.shaft}, ${p.direction},
        ${p.alarmVelocityRmsMmPerS}, ${p.tripVelocityRmsMmPerS}, ${p.baselineVelocityRmsMmPerS}, ${p.isoGroup}, ${p.isoFoundation})
      on conflict (machine_id, point_key) do update set
        quantity = excluded.quantity, unit = excluded.unit, near = excluded.near, shaft = excluded.shaft,
        direction = excluded.direction, alarm_velocity_rms_mm_per_s = excluded.alarm_velocity_rms_mm_per_s,
        trip_velocity_rms_mm_per_s = excluded.trip_velocity_rms_mm_per_s,
        baseline_velocity_rms_mm_per_s = excluded.baseline_velocity_rms_mm_per_s,
        iso_group = excluded.iso_group, iso_foundation = excluded.iso_foundation, retired_at = null`;
  }
  const keys = input.points.map((p) => p.pointKey);
  await tx`
    update points set retired_at = now()
    where machine_id = ${machineId} and retired_at is null and point_key <> all(${tx.array(keys)}::text[])`;
  return { machineId, version };
}

export async function getModelVersion(
  sql: Queryable,
  machineId: number,
  version: number,
): Promise<{ version: number; model: unknown; createdAt: Date } | null> {
  const [row] = await sql<{ version: number; model: unknown; createdAt: Date }[]>`
    select version, model, created_at as "createdAt" from machine_models where machine_id = ${machineId} and version = ${version}`;
  return row ?? null;
}

/**
 * The model version a recording taken at `at` is analysed against: the newest version valid from at
 * or before that time, or the first version for recordings older than every version (history
 * uploaded after the machine was described). Null when the machine has no model.
 */
export async function modelVersionAt(sql: Queryable, machineId: number, at: Date): Promise<number | null> {
  const [row] = await sql<{ version: number | null }[]>`
    select coalesce(
      (select max(version) from machine_models where machine_id = ${machineId} and valid_from <= ${at}),
      (select min(version) from machine_models where machine_id = ${machineId})) as version`;
  return row?.version ?? null;
}

export async function listModelVersions(
  sql: Queryable,
  machineId: number,
): Promise<Array<{ version: number; validFrom: Date; createdAt: Date }>> {
  return sql<Array<{ version: number; validFrom: Date; createdAt: Date }>>`
    select version, valid_from as "validFrom", created_at as "createdAt"
    from machine_models where machine_id = ${machineId} order by version`;
}

export async function listPoints(sql: Queryable, machineId: number, includeRetired = false): Promise<PointRow[]> {
  return includeRetired
    ? sql<PointRow[]>`select ${pointColumns(sql)} from points where machine_id = ${machineId} order by id`
    : sql<PointRow[]>`select ${pointColumns(sql)} from points where machine_id = ${machineId} and retired_at is null order by id`;
}

/** The current points of every machine of a site. */
export async function listSitePoints(sql: Queryable, siteId: string): Promise<PointRow[]> {
  return sql<PointRow[]>`
    select ${pointColumns(sql)} from points
    where retired_at is null and machine_id in (select id from machines where site_id = ${siteId}) order by id`;
}

export async function findPoint(sql: Queryable, machineId: number, pointKey: string): Promise<PointRow | null> {
  const [row] = await sql<PointRow[]>`
    select ${pointColumns(sql)} from points where machine_id = ${machineId} and point_key = ${pointKey}`;
  return row ?? null;
}

export async function getPointById(sql: Queryable, pointId: number): Promise<PointRow | null> {
  const [row] = await sql<PointRow[]>`select ${pointColumns(sql)} from points where id = ${pointId}`;
  return row ?? null;
}

// ---------------------------------------------------------------- recordings

export interface RecordingRow {
  id: string;
  siteId: string;
  pointId: number;
  machineKey: string;
  pointKey: string;
  recordedAt: Date;
  receivedAt: Date;
  sampleRateHz: number;
  sampleCount: number;
  channels: Array<{ name: string; unit: string }>;
  contentHash: Buffer;
  idempotencyKey: string | null;
  sourceFormat: string;
  speedRpm: number | null;
  metadata: Record<string, string>;
  /** When the retention setting dropped the raw samples; null while they are kept. */
  samplesPurgedAt: Date | null;
  /** The channel (1-based) the upload asked the analysis to read, or null when the analysis chooses; re-analyses read it too. */
  analysisChannel: number | null;
}

export interface NewRecording {
  siteId: string;
  pointId: number;
  recordedAt: Date;
  sampleRateHz: number;
  sampleCount: number;
  channels: Array<{ name: string; unit: string }>;
  samples: Buffer;
  contentHash: Buffer;
  idempotencyKey: string | null;
  sourceFormat: string;
  speedRpm: number | null;
  metadata: Record<string, string>;
  uploadedBy: string | null;
  /** 'queued' when a job of the analysis queue will analyse it. */
  analysisState?: 'queued' | 'done';
  /** The channel (1-based) to analyse; null or absent lets the analysis choose. */
  analysisChannel?: number | null;
}

const recordingColumns = (sql: Queryable) => sql`
  r.id, r.site_id as "siteId", r.point_id as "pointId", m.machine_key as "machineKey", p.point_key as "pointKey",
  r.recorded_at as "recordedAt", r.received_at as "receivedAt", r.sample_rate_hz as "sampleRateHz",
  r.sample_count as "sampleCount", r.channels, r.content_hash as "contentHash", r.idempotency_key as "idempotencyKey",
  r.source_format as "sourceFormat", r.speed_rpm as "speedRpm", r.metadata, r.samples_purged_at as "samplesPurgedAt",
  r.analysis_channel as "analysisChannel"`;

/** Serialises every write that touches one point's trends and alarms (ingest, re-analysis). */
export async function lockPoint(tx: Queryable, pointId: number): Promise<void> {
  // two-key form: the first key names what is locked, so other advisory locks cannot collide
  await tx`select pg_advisory_xact_lock(${7_305_018}, ${pointId})`;
}

/**
 * The earlier recording a retry repeats: same site and Idempotency-Key, or without a key the same
 * point and content hash.
 */
export async function findDuplicateRecording(
  sql: Queryable,
  q: { siteId: string; pointId: number; idempotencyKey: string | null; contentHash: Buffer },
): Promise<RecordingRow | null> {
  const rows = q.idempotencyKey !== null
    ? await sql<RecordingRow[]>`
        select ${recordingColumns(sql)} from recordings r join points p on p.id = r.point_id join machines m on m.id = p.machine_id
        where r.site_id = ${q.siteId} and r.idempotency_key = ${q.idempotencyKey}`
    : await sql<RecordingRow[]>`
        select ${recordingColumns(sql)} from recordings r join points p on p.id = r.point_id join machines m on m.id = p.machine_id
        where r.point_id = ${q.pointId} and r.content_hash = ${q.contentHash} and r.idempotency_key is null`;
  return rows[0] ?? null;
}

/** Samples travel as base64 text (a third smaller than the driver's hex form of bytea), decoded by the server. */
export async function insertRecording(tx: Queryable, r: NewRecording): Promise<string> {
  const [row] = await tx<{ id: string }[]>`
    insert into recordings (site_id, point_id, recorded_at, sample_rate_hz, sample_count, channels, samples,
      content_hash, idempotency_key, source_format, speed_rpm, metadata, uploaded_by, analysis_state, analysis_channel)
    values (${r.siteId}, ${r.pointId}, ${r.recordedAt}, ${r.sampleRateHz}, ${r.sampleCount}, ${json(tx, r.channels)},
      decode(${r.samples.toString('base64')}, 'base64'), ${r.contentHash}, ${r.idempotencyKey}, ${r.sourceFormat}, ${r.speedRpm}, ${json(tx, r.metadata)},
      ${r.uploadedBy}, ${r.analysisState ?? 'done'}, ${r.analysisChannel ?? null})
    returning id`;
  return row!.id;
}

export async function getRecording(sql: Queryable, siteId: string, recordingId: string): Promise<RecordingRow | null> {
  if (!isUuid(recordingId)) return null;
  const [row] = await sql<RecordingRow[]>`
    select ${recordingColumns(sql)} from recordings r join points p on p.id = r.point_id join machines m on m.id = p.machine_id
    where r.id = ${recordingId} and r.site_id = ${siteId}`;
  return row ?? null;
}

export type AnalysisState = 'queued' | 'done' | 'failed';

/** Where a recording's analysis stands, and the problem it failed with; null for an unknown id. */
export async function getAnalysisState(
  sql: Queryable,
  recordingId: string,
): Promise<{ state: AnalysisState; problem: { slug: string; detail: string; code?: string } | null } | null> {
  const [row] = await sql<{ state: AnalysisState; problem: { slug: string; detail: string; code?: string } | null }[]>`
    select analysis_state as state, analysis_problem as problem from recordings where id = ${recordingId}`;
  return row ?? null;
}

export async function setAnalysisState(
  tx: Queryable,
  recordingId: string,
  state: AnalysisState,
  problem: { slug: string; detail: string; code?: string } | null = null,
): Promise<void> {
  await tx`update recordings set analysis_state = ${state}, analysis_problem = ${problem === null ? null : json(tx, problem)} where id = ${recordingId}`;
}

/** What a worker needs of a queued recording: the row, its point and machine. */
export async function recordingForAnalysis(
  sql: Queryable,
  recordingId: string,
): Promise<(RecordingRow & { machineId: number; state: AnalysisState }) | null> {
  const [row] = await sql<(RecordingRow & { machineId: number; state: AnalysisState })[]>`
    select ${recordingColumns(sql)}, m.id as "machineId", r.analysis_state as state
    from recordings r join points p on p.id = r.point_id join machines m on m.id = p.machine_id
    where r.id = ${recordingId}`;
  return row ?? null;
}

/**
 * Drops the raw samples of up to `limit` analysed recordings taken before `before` (the retention setting);
 * returns how many. Rows, analyses and trends stay. Replicas running it at once skip each other's rows.
 */
export async function purgeSamples(sql: Queryable, before: Date, limit: number): Promise<number> {
  const rows = await sql`
    update recordings set samples = ''::bytea, samples_purged_at = now()
    where id in (
      select id from recordings
      where recorded_at < ${before} and samples_purged_at is null and analysis_state <> 'queued'
      order by recorded_at limit ${limit} for update skip locked)
    returning id`;
  return rows.count;
}

export async function getRecordingSamples(sql: Queryable, recordingId: string): Promise<Buffer | null> {
  const [row] = await sql<{ samples: Buffer }[]>`select samples from recordings where id = ${recordingId}`;
  return row?.samples ?? null;
}

export interface RecordingListRow {
  id: string;
  recordedAt: Date;
  sampleRateHz: number;
  sampleCount: number;
  channels: number;
  analysisId: string | null;
  velocityRmsMmPerS: number | null;
  zone: 'A' | 'B' | 'C' | 'D' | null;
  topHypothesis: { fault: string; component: string; score: number; reason?: string } | null;
}

export async function listRecordings(
  sql: Queryable,
  pointId: number,
  limit: number,
  before: Date | null,
): Promise<RecordingListRow[]> {
  return sql<RecordingListRow[]>`
    select r.id, r.recorded_at as "recordedAt", r.sample_rate_hz as "sampleRateHz", r.sample_count as "sampleCount",
      jsonb_array_length(r.channels) as channels, a.id as "analysisId",
      a.velocity_rms_mm_per_s as "velocityRmsMmPerS", a.zone, a.top_hypothesis as "topHypothesis"
    from recordings r left join analyses a on a.recording_id = r.id and a.is_current
    where r.point_id = ${pointId} and r.recorded_at < ${before ?? new Date('9999-01-01T00:00:00Z')}
    order by r.recorded_at desc, r.id desc
    limit ${limit}`;
}

/** Ids and times of a machine's recordings, oldest first (for re-analysis). */
export async function listMachineRecordingIds(
  sql: Queryable,
  machineId: number,
): Promise<Array<{ id: string; pointId: number }>> {
  return sql<Array<{ id: string; pointId: number }>>`
    select r.id, r.point_id as "pointId" from recordings r join points p on p.id = r.point_id
    where p.machine_id = ${machineId} order by r.recorded_at, r.id`;
}

// ---------------------------------------------------------------- re-analyses

export interface ReanalysisRow {
  id: string;
  machineId: number;
  machineKey: string;
  modelVersion: number;
  total: number;
  analysed: number;
  failed: Array<{ recordingId: string; reason: string }>;
  createdAt: Date;
  finishedAt: Date | null;
}

export async function createReanalysis(tx: Queryable, r: { machineId: number; modelVersion: number; total: number; createdBy: string | null }): Promise<string> {
  const [row] = await tx<{ id: string }[]>`
    insert into reanalyses (machine_id, model_version, total, created_by, finished_at)
    values (${r.machineId}, ${r.modelVersion}, ${r.total}, ${r.createdBy}, ${r.total === 0 ? new Date() : null})
    returning id`;
  return row!.id;
}

/** The re-analysis of a site's machine with its progress; null for another site's or an unknown id. */
export async function getReanalysis(sql: Queryable, siteId: string | null, id: string): Promise<ReanalysisRow | null> {
  if (!isUuid(id)) return null;
  const [row] = await sql<ReanalysisRow[]>`
    select r.id, r.machine_id as "machineId", m.machine_key as "machineKey", r.model_version as "modelVersion", r.total,
      (select count(*)::int from reanalysis_items i where i.reanalysis_id = r.id and i.failure is null) as analysed,
      coalesce((select jsonb_agg(jsonb_build_object('recordingId', i.recording_id, 'reason', i.failure) order by i.done_at)
        from reanalysis_items i where i.reanalysis_id = r.id and i.failure is not null), '[]'::jsonb) as failed,
      r.created_at as "createdAt", r.finished_at as "finishedAt"
    from reanalyses r join machines m on m.id = r.machine_id
    where r.id = ${id} and (${siteId}::uuid is null or m.site_id = ${siteId}::uuid)`;
  return row ?? null;
}

/**
 * Records one recording of a re-analysis as done (failure null) or failed; false when it was recorded
 * already (a repeated job). Marks the re-analysis finished with its last item.
 */
export async function recordReanalysisItem(tx: Queryable, reanalysisId: string, recordingId: string, failure: string | null): Promise<boolean> {
  const inserted = await tx`
    insert into reanalysis_items (reanalysis_id, recording_id, failure) values (${reanalysisId}, ${recordingId}, ${failure})
    on conflict do nothing returning recording_id`;
  if (inserted.count === 0) return false;
  await tx`
    update reanalyses set finished_at = now()
    where id = ${reanalysisId} and finished_at is null
      and (select count(*) from reanalysis_items where reanalysis_id = ${reanalysisId}) >= total`;
  return true;
}

export async function reanalysisItemDone(sql: Queryable, reanalysisId: string, recordingId: string): Promise<boolean> {
  const [row] = await sql<{ done: boolean }[]>`
    select exists (select 1 from reanalysis_items where reanalysis_id = ${reanalysisId} and recording_id = ${recordingId}) as done`;
  return row!.done;
}

// ---------------------------------------------------------------- analyses

export interface StoredAnalysis {
  id: string;
  recordingId: string;
  modelVersion: number | null;
  softwareVersion: string;
  current: boolean;
  createdAt: Date;
  result: Record<string, unknown>;
}

export interface NewAnalysis {
  recordingId: string;
  modelVersion: number | null;
  softwareVersion: string;
  speedHz: number | null;
  speedSource: string | null;
  velocityRmsMmPerS: number | null;
  zone: string | null;
  /** The analysis's own grading of the overall velocity (alarm-row.ts): stored, never derived again. */
  alarmState: 'normal' | 'alarm' | 'trip' | null;
  alarmLevelMmPerS: number | null;
  tripLevelMmPerS: number | null;
  topHypothesis: { fault: string; component: string; score: number; reason: string } | null;
  /** The RecordingAnalysis as JSON text (made once by the caller, cast to jsonb here). */
  resultJson: string;
}

/** Stores an analysis as the recording's current one; earlier analyses stay, no longer current. */
export async function insertAnalysis(tx: Queryable, a: NewAnalysis): Promise<{ id: string; createdAt: Date }> {
  await tx`update analyses set is_current = false where recording_id = ${a.recordingId} and is_current`;
  const [row] = await tx<{ id: string; createdAt: Date }[]>`
    insert into analyses (recording_id, model_version, software_version, is_current, speed_hz, speed_source,
      velocity_rms_mm_per_s, zone, alarm_state, alarm_level_mm_per_s, trip_level_mm_per_s, top_hypothesis, result)
    values (${a.recordingId}, ${a.modelVersion}, ${a.softwareVersion}, true, ${a.speedHz}, ${a.speedSource},
      ${a.velocityRmsMmPerS}, ${a.zone}, ${a.alarmState}, ${a.alarmLevelMmPerS}, ${a.tripLevelMmPerS},
      ${a.topHypothesis === null ? null : json(tx, a.topHypothesis)}, ${a.resultJson}::text::jsonb)
    returning id, created_at as "createdAt"`;
  return row!;
}

export async function getCurrentAnalysis(sql: Queryable, recordingId: string): Promise<StoredAnalysis | null> {
  const [row] = await sql<StoredAnalysis[]>`
    select id, recording_id as "recordingId", model_version as "modelVersion", software_version as "softwareVersion",
      is_current as current, created_at as "createdAt", result
    from analyses where recording_id = ${recordingId} and is_current`;
  return row ?? null;
}

export async function listAnalyses(
  sql: Queryable,
  recordingId: string,
): Promise<Array<Omit<StoredAnalysis, 'result'>>> {
  return sql<Array<Omit<StoredAnalysis, 'result'>>>`
    select id, recording_id as "recordingId", model_version as "modelVersion", software_version as "softwareVersion",
      is_current as current, created_at as "createdAt"
    from analyses where recording_id = ${recordingId} order by created_at, id`;
}

// ---------------------------------------------------------------- trend values

function utcDay(at: Date): Date {
  return new Date(Date.UTC(at.getUTCFullYear(), at.getUTCMonth(), at.getUTCDate()));
}

/** 'YYYY-MM-DD' of the UTC day of `at`, bound as a date parameter (no session time zone involved). */
function dayText(at: Date): string {
  return at.toISOString().slice(0, 10);
}

/** Month partitions of trend_values this process has made sure of, per database pool. */
const trendMonths = new WeakMap<object, Set<string>>();

/**
 * Makes sure trend_values has the partition of the UTC month of `at` (migration 0008), before a transaction
 * writes values of that month. Once per month and process; a month whose values already sit in the default
 * partition (written before its partition existed) keeps them there, which the queries read alike.
 */
export async function ensureTrendMonth(sql: Queryable, at: Date): Promise<void> {
  const start = new Date(Date.UTC(at.getUTCFullYear(), at.getUTCMonth(), 1));
  const end = new Date(Date.UTC(at.getUTCFullYear(), at.getUTCMonth() + 1, 1));
  const name = `trend_values_${start.toISOString().slice(0, 7).replace('-', '_')}`;
  const known = trendMonths.get(sql) ?? new Set<string>();
  trendMonths.set(sql, known);
  if (known.has(name)) return;
  try {
    // identifiers cannot be bound: the name is made from two numbers above, the bounds are ISO times
    await sql.unsafe(`create table if not exists ${name} partition of trend_values for values from ('${start.toISOString()}') to ('${end.toISOString()}')`);
  } catch (err) {
    // 23514: the default partition already holds values of this month; 42P07: a replica made it meanwhile
    const code = (err as { code?: string }).code;
    if (code !== '23514' && code !== '42P07') throw err;
  }
  known.add(name);
}

/**
 * Replaces a recording's trend values with those of its current analysis and keeps the daily roll-up
 * in step. A first analysis adds to the day's aggregates; a re-analysis recomputes the day from the
 * values. Call inside a transaction holding lockPoint(pointId).
 */
export async function writeTrendValues(
  tx: Queryable,
  v: { pointId: number; recordingId: string; analysisId: string; recordedAt: Date; indicators: Record<string, number> },
): Promise<void> {
  const entries = Object.entries(v.indicators).filter(([, x]) => Number.isFinite(x));
  const names = entries.map(([k]) => k);
  const values = entries.map(([, x]) => x);
  const removed = await tx`delete from trend_values where recording_id = ${v.recordingId}`;
  if (entries.length > 0) {
    await tx`
      insert into trend_values (point_id, indicator, recorded_at, recording_id, analysis_id, value)
      select ${v.pointId}, t.indicator, ${v.recordedAt}, ${v.recordingId}, ${v.analysisId}, t.value
      from unnest(${tx.array(names)}::text[], ${tx.array(values)}::float8[]) as t(indicator, value)`;
  }
  const day = utcDay(v.recordedAt);
  if (removed.count === 0) {
    if (entries.length === 0) return;
    await tx`
      insert into trend_daily (point_id, indicator, day, count, sum, min, max, last_value, last_at)
      select ${v.pointId}, t.indicator, ${dayText(day)}::date, 1, t.value, t.value, t.value, t.value, ${v.recordedAt}
      from unnest(${tx.array(names)}::text[], ${tx.array(values)}::float8[]) as t(indicator, value)
      on conflict (point_id, indicator, day) do update set
        count = trend_daily.count + 1,
        sum = trend_daily.sum + excluded.sum,
        min = least(trend_daily.min, excluded.min),
        max = greatest(trend_daily.max, excluded.max),
        last_value = case when excluded.last_at >= trend_daily.last_at then excluded.last_value else trend_daily.last_value end,
        last_at = greatest(trend_daily.last_at, excluded.last_at)`;
    return;
  }
  const dayEnd = new Date(day.getTime() + 86_400_000);
  await tx`delete from trend_daily where point_id = ${v.pointId} and day = ${dayText(day)}::date`;
  await tx`
    insert into trend_daily (point_id, indicator, day, count, sum, min, max, last_value, last_at)
    select point_id, indicator, ${dayText(day)}::date, count(*), sum(value), min(value), max(value),
      (array_agg(value order by recorded_at desc))[1], max(recorded_at)
    from trend_values
    where point_id = ${v.pointId} and recorded_at >= ${day} and recorded_at < ${dayEnd}
    group by point_id, indicator`;
}

/**
 * The newest `count` values of each of a point's `indicators` recorded at or before `upTo`, oldest first (the alarm
 * rule's persistence and hysteresis look at them). Indicators with no value are absent from the map.
 */
export async function recentTrendValues(
  tx: Queryable,
  q: { pointId: number; indicators: string[]; upTo: Date; count: number },
): Promise<Map<string, number[]>> {
  const out = new Map<string, number[]>();
  if (q.indicators.length === 0) return out;
  const rows = await tx<Array<{ indicator: string; value: number }>>`
    select indicator, value from (
      select indicator, value, recorded_at, row_number() over (partition by indicator order by recorded_at desc) as k
      from trend_values
      where point_id = ${q.pointId} and indicator = any(${tx.array(q.indicators)}::text[]) and recorded_at <= ${q.upTo}
    ) t where k <= ${q.count} order by indicator, recorded_at`;
  for (const r of rows) {
    const list = out.get(r.indicator) ?? [];
    list.push(r.value);
    out.set(r.indicator, list);
  }
  return out;
}

/** Every value of one series in [from, to), oldest first: what a forecast reads. */
export async function trendSeries(
  sql: Queryable,
  q: { pointId: number; indicator: string; from: Date; to: Date },
): Promise<Array<{ recordedAt: Date; value: number }>> {
  return sql<Array<{ recordedAt: Date; value: number }>>`
    select recorded_at as "recordedAt", value from trend_values
    where point_id = ${q.pointId} and indicator = ${q.indicator} and recorded_at >= ${q.from} and recorded_at < ${q.to}
    order by recorded_at, recording_id`;
}

/** One indicator's values at every current point of a site's machines in [from, to), oldest first, by point. */
export async function siteSeries(
  sql: Queryable,
  q: { siteId: string; indicator: string; from: Date; to: Date },
): Promise<Map<number, Array<{ recordedAt: Date; value: number }>>> {
  const rows = await sql<Array<{ pointId: number; recordedAt: Date; value: number }>>`
    select t.point_id as "pointId", t.recorded_at as "recordedAt", t.value
    from trend_values t join points p on p.id = t.point_id join machines m on m.id = p.machine_id
    where m.site_id = ${q.siteId} and p.retired_at is null and t.indicator = ${q.indicator}
      and t.recorded_at >= ${q.from} and t.recorded_at < ${q.to}
    order by t.point_id, t.recorded_at, t.recording_id`;
  const out = new Map<number, Array<{ recordedAt: Date; value: number }>>();
  for (const r of rows) {
    const list = out.get(r.pointId) ?? [];
    list.push({ recordedAt: r.recordedAt, value: r.value });
    out.set(r.pointId, list);
  }
  return out;
}

export type Bucket = 'day' | 'week' | 'month';

export interface BucketRow {
  start: Date;
  count: number;
  min: number;
  mean: number;
  max: number;
  last: number;
  /** Zone and alarm state the analysis of the bucket's largest value graded (graded: true only). */
  maxZone?: 'A' | 'B' | 'C' | 'D' | null;
  maxAlarmState?: 'normal' | 'alarm' | 'trip' | null;
}

/** One indicator of one point, bucketed by UTC day, ISO week (from Monday) or calendar month, in [from, to). */
export async function trendBuckets(
  sql: Queryable,
  q: { pointId: number; indicator: string; bucket: Bucket; from: Date; to: Date; graded?: boolean },
): Promise<BucketRow[]> {
  if (q.graded) {
    // the overall velocity: each bucket also carries the grading of the analysis behind its largest value
    return sql<BucketRow[]>`
      select date_trunc(${q.bucket}, v.recorded_at, 'UTC') as start, count(*)::int as count,
        min(v.value) as min, avg(v.value) as mean, max(v.value) as max,
        (array_agg(v.value order by v.recorded_at desc, v.recording_id desc))[1] as last,
        (array_agg(a.zone order by v.value desc, v.recorded_at desc))[1] as "maxZone",
        (array_agg(a.alarm_state order by v.value desc, v.recorded_at desc))[1] as "maxAlarmState"
      from trend_values v left join analyses a on a.id = v.analysis_id
      where v.point_id = ${q.pointId} and v.indicator = ${q.indicator} and v.recorded_at >= ${q.from} and v.recorded_at < ${q.to}
      group by 1 order by 1`;
  }
  return sql<BucketRow[]>`
    select date_trunc(${q.bucket}, recorded_at, 'UTC') as start, count(*)::int as count,
      min(value) as min, avg(value) as mean, max(value) as max,
      (array_agg(value order by recorded_at desc, recording_id desc))[1] as last
    from trend_values
    where point_id = ${q.pointId} and indicator = ${q.indicator} and recorded_at >= ${q.from} and recorded_at < ${q.to}
    group by 1 order by 1`;
}

/** How the newest analysis of a point graded the overall velocity, and the model version it graded against. */
export interface GradedLevels {
  /** The alarm and trip levels stored with the analysis; null when it stored none (analyses made before levels were graded). */
  levels: { alarmLevel: number | null; tripLevel: number | null } | null;
  modelVersion: number | null;
}

/**
 * For each point, the grading of its newest analysed recording taken before `to` (a recording still queued has no
 * analysis and is passed over); points with no analysed recording are absent. One index range scan per point
 * (recordings_point_time), newest first, stopping at the first analysed recording.
 */
export async function latestGradedLevels(sql: Queryable, pointIds: readonly number[], to: Date): Promise<Map<number, GradedLevels>> {
  const out = new Map<number, GradedLevels>();
  if (pointIds.length === 0) return out;
  const rows = await sql<{ pointId: number; alarmLevel: number | null; tripLevel: number | null; modelVersion: number | null }[]>`
    select p.id as "pointId", g.alarm_level_mm_per_s as "alarmLevel", g.trip_level_mm_per_s as "tripLevel", g.model_version as "modelVersion"
    from unnest(${sql.array([...pointIds])}::int[]) as p(id)
    cross join lateral (
      select a.alarm_level_mm_per_s, a.trip_level_mm_per_s, a.model_version
      from recordings r join analyses a on a.recording_id = r.id and a.is_current
      where r.point_id = p.id and r.recorded_at < ${to}
      order by r.recorded_at desc limit 1) g`;
  for (const r of rows) {
    out.set(r.pointId, {
      levels: r.alarmLevel === null && r.tripLevel === null ? null : { alarmLevel: r.alarmLevel, tripLevel: r.tripLevel },
      modelVersion: r.modelVersion,
    });
  }
  return out;
}

/** Every indicator recorded at a point (or at every point of a machine), with how many values it has. */
export async function listIndicators(
  sql: Queryable,
  q: { machineId: number; pointId: number | null },
): Promise<Array<{ pointId: number; indicator: string; count: number }>> {
  return q.pointId !== null
    ? sql<Array<{ pointId: number; indicator: string; count: number }>>`
        select point_id as "pointId", indicator, sum(count)::int as count from trend_daily
        where point_id = ${q.pointId} group by point_id, indicator order by indicator`
    : sql<Array<{ pointId: number; indicator: string; count: number }>>`
        select d.point_id as "pointId", d.indicator, sum(d.count)::int as count
        from trend_daily d join points p on p.id = d.point_id
        where p.machine_id = ${q.machineId} group by d.point_id, d.indicator order by d.point_id, d.indicator`;
}

export interface RankingRow {
  machineKey: string;
  pointKey: string;
  indicator: string;
  before: number;
  after: number;
  rise: number;
  risePercent: number | null;
}

/**
 * For every machine of a site, the point and indicator whose mean rose most between the seven UTC days
 * ending `weeks` weeks before `asOf` and the seven days ending at `asOf` (both inclusive of their last
 * day). Ranked by relative rise, then absolute rise. Reads the daily roll-up only.
 */
export async function fleetRanking(
  sql: Queryable,
  q: { siteId: string; indicators: string[]; weeks: number; asOf: Date; limit: number },
): Promise<RankingRow[]> {
  const today = utcDay(q.asOf);
  const dayMs = 86_400_000;
  const afterFrom = new Date(today.getTime() - 6 * dayMs);
  const beforeTo = new Date(today.getTime() - 7 * q.weeks * dayMs);
  const beforeFrom = new Date(beforeTo.getTime() - 6 * dayMs);
  const window = (from: Date, to: Date) => sql`
    select d.point_id, d.indicator, sum(d.sum) / nullif(sum(d.count), 0) as mean
    from trend_daily d join points p on p.id = d.point_id join machines m on m.id = p.machine_id
    where m.site_id = ${q.siteId} and d.indicator = any(${sql.array(q.indicators)}::text[])
      and d.day >= ${dayText(from)}::date and d.day <= ${dayText(to)}::date
    group by d.point_id, d.indicator`;
  // each window is its own range scan of trend_daily_window (indicator, day, point_id)
  return sql<RankingRow[]>`
    with before as (${window(beforeFrom, beforeTo)}), after as (${window(afterFrom, today)}),
    rises as (
      select b.point_id, b.indicator, b.mean as before, a.mean as after, a.mean - b.mean as rise,
        case when b.mean > 0 then 100 * (a.mean - b.mean) / b.mean end as rise_percent
      from before b join after a on a.point_id = b.point_id and a.indicator = b.indicator
      where b.mean is not null and a.mean is not null
    ), best as (
      select distinct on (p.machine_id) p.machine_id, p.point_key, r.indicator, r.before, r.after, r.rise, r.rise_percent
      from rises r join points p on p.id = r.point_id
      order by p.machine_id, r.rise_percent desc nulls last, r.rise desc
    )
    select m.machine_key as "machineKey", b.point_key as "pointKey", b.indicator, b.before, b.after, b.rise,
      b.rise_percent as "risePercent"
    from best b join machines m on m.id = b.machine_id
    order by b.rise_percent desc nulls last, b.rise desc, m.machine_key
    limit ${q.limit}`;
}

/** Weekly means of one indicator at the worst point of each machine of a site, since `from`. */
export async function weeklySparklines(
  sql: Queryable,
  q: { siteId: string; indicator: string; from: Date },
): Promise<Array<{ machineId: number; start: Date; mean: number }>> {
  return sql<Array<{ machineId: number; start: Date; mean: number }>>`
    select machine_id as "machineId", start, max(mean) as mean from (
      select p.machine_id, d.point_id, date_trunc('week', d.day::timestamp) at time zone 'UTC' as start,
        sum(d.sum) / sum(d.count) as mean
      from trend_daily d join points p on p.id = d.point_id join machines m on m.id = p.machine_id
      where m.site_id = ${q.siteId} and d.indicator = ${q.indicator} and d.day >= ${dayText(q.from)}::date
      group by 1, 2, 3) per_point
    group by 1, 2 order by 1, 2`;
}

/** The newest recording of every live point of a site's machines, with its current analysis. */
export async function latestPerPoint(
  sql: Queryable,
  siteId: string,
): Promise<Array<{ machineId: number; pointKey: string; recordedAt: Date; zone: string | null; topHypothesis: RecordingListRow['topHypothesis'] }>> {
  return sql`
    select p.machine_id as "machineId", p.point_key as "pointKey", r.recorded_at as "recordedAt", a.zone,
      a.top_hypothesis as "topHypothesis"
    from points p join machines m on m.id = p.machine_id
    join lateral (select id, recorded_at from recordings where point_id = p.id order by recorded_at desc limit 1) r on true
    left join analyses a on a.recording_id = r.id and a.is_current
    where m.site_id = ${siteId} and p.retired_at is null` as never;
}

// ---------------------------------------------------------------- alarms

export interface AlarmRow {
  id: string;
  machineId: string;
  pointId: string;
  indicator: string;
  level: 'alarm' | 'trip';
  value: number;
  threshold: number;
  recordingId: string | null;
  raisedAt: Date;
  acknowledgedAt: Date | null;
  acknowledgedBy: string | null;
  clearedAt: Date | null;
  clearedBy: string | null;
  /** The indicator's newest value at the point and when it was recorded (null when none is stored). */
  currentValue: number | null;
  currentAt: Date | null;
}

const alarmColumns = (sql: Queryable) => sql`
  a.id, m.machine_key as "machineId", p.point_key as "pointId", a.indicator, a.level, a.value, a.threshold,
  a.recording_id as "recordingId", a.raised_at as "raisedAt", a.acknowledged_at as "acknowledgedAt",
  a.acknowledged_by as "acknowledgedBy", a.cleared_at as "clearedAt", a.cleared_by as "clearedBy",
  (select tv.value from trend_values tv where tv.point_id = a.point_id and tv.indicator = a.indicator
    order by tv.recorded_at desc limit 1) as "currentValue",
  (select max(tv.recorded_at) from trend_values tv where tv.point_id = a.point_id and tv.indicator = a.indicator) as "currentAt"`;

export interface OpenAlarm {
  id: string;
  level: 'alarm' | 'trip';
  indicator: string;
}

export async function openAlarms(tx: Queryable, pointId: number): Promise<OpenAlarm[]> {
  return tx<OpenAlarm[]>`select id, level, indicator from alarms where point_id = ${pointId} and cleared_at is null`;
}

/** The time of the newest recording of a point other than `exceptId` (null when there is none). */
export async function newestRecordedAt(tx: Queryable, pointId: number, exceptId: string): Promise<Date | null> {
  const [row] = await tx<{ at: Date | null }[]>`
    select max(recorded_at) as at from recordings where point_id = ${pointId} and id <> ${exceptId}`;
  return row?.at ?? null;
}

export async function raiseAlarm(
  tx: Queryable,
  a: { siteId: string; pointId: number; indicator: string; level: 'alarm' | 'trip'; value: number; threshold: number; recordingId: string; raisedAt: Date },
): Promise<string> {
  const [row] = await tx<{ id: string }[]>`
    insert into alarms (site_id, point_id, indicator, level, value, threshold, recording_id, raised_at)
    values (${a.siteId}, ${a.pointId}, ${a.indicator}, ${a.level}, ${a.value}, ${a.threshold}, ${a.recordingId}, ${a.raisedAt})
    returning id`;
  return row!.id;
}

/** Raises an open alarm to trip: it needs acknowledging again. */
export async function escalateAlarm(
  tx: Queryable,
  a: { id: string; value: number; threshold: number; recordingId: string },
): Promise<void> {
  await tx`
    update alarms set level = 'trip', value = ${a.value}, threshold = ${a.threshold}, recording_id = ${a.recordingId},
      acknowledged_at = null, acknowledged_by = null
    where id = ${a.id}`;
}

export async function clearAlarm(tx: Queryable, id: string, at: Date, by: string): Promise<void> {
  await tx`update alarms set cleared_at = ${at}, cleared_by = ${by} where id = ${id} and cleared_at is null`;
}

export async function listAlarms(sql: Queryable, siteId: string, state: 'active' | 'all', limit: number): Promise<AlarmRow[]> {
  return state === 'active'
    ? sql<AlarmRow[]>`
        select ${alarmColumns(sql)} from alarms a join points p on p.id = a.point_id join machines m on m.id = p.machine_id
        where a.site_id = ${siteId} and a.cleared_at is null order by a.raised_at desc, a.id limit ${limit}`
    : sql<AlarmRow[]>`
        select ${alarmColumns(sql)} from alarms a join points p on p.id = a.point_id join machines m on m.id = p.machine_id
        where a.site_id = ${siteId} order by a.raised_at desc, a.id limit ${limit}`;
}

export async function countOpenAlarmsByMachine(sql: Queryable, siteId: string): Promise<Map<number, number>> {
  const rows = await sql<{ machineId: number; n: number }[]>`
    select p.machine_id as "machineId", count(*)::int as n from alarms a join points p on p.id = a.point_id
    where a.site_id = ${siteId} and a.cleared_at is null group by 1`;
  return new Map(rows.map((r) => [r.machineId, r.n]));
}

export async function acknowledgeAlarm(sql: Queryable, siteId: string, alarmId: string, by: string): Promise<AlarmRow | null> {
  if (!isUuid(alarmId)) return null;
  const [found] = await sql<{ id: string }[]>`
    update alarms set acknowledged_at = coalesce(acknowledged_at, now()), acknowledged_by = coalesce(acknowledged_by, ${by})
    where id = ${alarmId} and site_id = ${siteId} returning id`;
  if (!found) return null;
  const [row] = await sql<AlarmRow[]>`
    select ${alarmColumns(sql)} from alarms a join points p on p.id = a.point_id join machines m on m.id = p.machine_id
    where a.id = ${alarmId}`;
  return row ?? null;
}

// ---------------------------------------------------------------- health

export async function ping(sql: Sql): Promise<void> {
  await sql`select 1`;
}

// ---------------------------------------------------------------- corrections (delete, move) and their audit log

/** What the audit log keeps of a recording: enough to tell which one it was and where it was filed. */
export interface RecordingIdentity {
  machineId: string;
  pointId: string;
  recordedAt: string;
  contentSha256: string;
  sourceFormat: string;
  sampleCount: number;
  sampleRateHz: number;
  zone: string | null;
  velocityRmsMmPerS: number | null;
}

export async function recordingIdentity(sql: Queryable, recordingId: string): Promise<RecordingIdentity | null> {
  const [row] = await sql<RecordingIdentity[]>`
    select m.machine_key as "machineId", p.point_key as "pointId", r.recorded_at as "recordedAt",
      encode(r.content_hash, 'hex') as "contentSha256", r.source_format as "sourceFormat", r.sample_count as "sampleCount",
      r.sample_rate_hz as "sampleRateHz", a.zone, a.velocity_rms_mm_per_s as "velocityRmsMmPerS"
    from recordings r join points p on p.id = r.point_id join machines m on m.id = p.machine_id
    left join analyses a on a.recording_id = r.id and a.is_current
    where r.id = ${recordingId}`;
  return row ? { ...row, recordedAt: new Date(row.recordedAt).toISOString() } : null;
}

/** Deletes a recording with its analyses and trend values (foreign keys cascade); its alarms keep a null recording. */
export async function deleteRecordingRow(tx: Queryable, recordingId: string): Promise<boolean> {
  const removed = await tx`delete from recordings where id = ${recordingId}`;
  return removed.count > 0;
}

/** Files a recording under another point and time. */
export async function moveRecordingRow(tx: Queryable, recordingId: string, pointId: number, recordedAt: Date): Promise<void> {
  await tx`update recordings set point_id = ${pointId}, recorded_at = ${recordedAt} where id = ${recordingId}`;
}

/**
 * Rebuilds one UTC day of a point's daily roll-up from its trend values, after a recording left that day
 * (deleted, or moved to another point or day).
 */
export async function rebuildTrendDay(tx: Queryable, pointId: number, at: Date): Promise<void> {
  const day = utcDay(at);
  const dayEnd = new Date(day.getTime() + 86_400_000);
  await tx`delete from trend_daily where point_id = ${pointId} and day = ${dayText(day)}::date`;
  await tx`
    insert into trend_daily (point_id, indicator, day, count, sum, min, max, last_value, last_at)
    select point_id, indicator, ${dayText(day)}::date, count(*), sum(value), min(value), max(value),
      (array_agg(value order by recorded_at desc))[1], max(recorded_at)
    from trend_values
    where point_id = ${pointId} and recorded_at >= ${day} and recorded_at < ${dayEnd}
    group by point_id, indicator`;
}

/**
 * The newest analysed recording of a point with its current trend values and the alarm and trip levels its analysis
 * graded the overall velocity with (null when it graded none); null when the point has no analysed recording. A
 * recording still queued is left out: its job applies the alarm rule when it stores the analysis.
 */
export async function newestRecordingValues(
  tx: Queryable,
  pointId: number,
): Promise<{ recordingId: string; recordedAt: Date; indicators: Record<string, number>; velocityLevels: { alarmLevel: number | null; tripLevel: number | null } | null } | null> {
  const [newest] = await tx<{ id: string; recordedAt: Date; alarmLevel: number | null; tripLevel: number | null }[]>`
    select r.id, r.recorded_at as "recordedAt", a.alarm_level_mm_per_s as "alarmLevel", a.trip_level_mm_per_s as "tripLevel"
    from recordings r join analyses a on a.recording_id = r.id and a.is_current
    where r.point_id = ${pointId} order by r.recorded_at desc, r.id desc limit 1`;
  if (!newest) return null;
  const rows = await tx<{ indicator: string; value: number }[]>`select indicator, value from trend_values where recording_id = ${newest.id}`;
  return {
    recordingId: newest.id,
    recordedAt: newest.recordedAt,
    indicators: Object.fromEntries(rows.map((r) => [r.indicator, r.value])),
    velocityLevels: newest.alarmLevel === null && newest.tripLevel === null ? null : { alarmLevel: newest.alarmLevel, tripLevel: newest.tripLevel },
  };
}

/** Clears every open alarm of a point (its last recording is gone). */
export async function clearPointAlarms(tx: Queryable, pointId: number, at: Date, by: string): Promise<number> {
  const cleared = await tx`update alarms set cleared_at = ${at}, cleared_by = ${by} where point_id = ${pointId} and cleared_at is null`;
  return cleared.count;
}

export interface AuditEntry {
  id: string;
  recordingId: string;
  action: 'delete' | 'move';
  at: Date;
  by: string;
  reason: string;
  before: RecordingIdentity;
  after: { machineId: string; pointId: string; recordedAt: string } | null;
}

export async function insertAuditEntry(
  tx: Queryable,
  e: { siteId: string; recordingId: string; action: 'delete' | 'move'; byKeyId: string; by: string; reason: string; before: RecordingIdentity; after: AuditEntry['after'] },
): Promise<AuditEntry> {
  const [row] = await tx<AuditEntry[]>`
    insert into recording_audit (site_id, recording_id, action, by_key_id, by_name, reason, before, after)
    values (${e.siteId}, ${e.recordingId}, ${e.action}, ${e.byKeyId}, ${e.by}, ${e.reason}, ${json(tx, e.before)}, ${e.after === null ? null : json(tx, e.after)})
    returning id::text, recording_id as "recordingId", action, at, by_name as by, reason, before, after`;
  return row!;
}

/** A site's corrections, newest first; optionally those touching one machine (before or after) or one recording. */
export async function listAuditEntries(
  sql: Queryable,
  siteId: string,
  q: { machineKey?: string; recordingId?: string; limit: number },
): Promise<AuditEntry[]> {
  const machine = q.machineKey ?? null;
  const recording = q.recordingId !== undefined && isUuid(q.recordingId) ? q.recordingId : q.recordingId !== undefined ? '00000000-0000-0000-0000-000000000000' : null;
  return sql<AuditEntry[]>`
    select id::text, recording_id as "recordingId", action, at, by_name as by, reason, before, after
    from recording_audit
    where site_id = ${siteId}
      and (${machine}::text is null or before->>'machineId' = ${machine} or after->>'machineId' = ${machine})
      and (${recording}::uuid is null or recording_id = ${recording}::uuid)
    order by at desc, id desc
    limit ${q.limit}`;
}

/** Clears the open alarms of a point that a recording raised (or last escalated); returns how many. */
export async function clearAlarmsRaisedBy(tx: Queryable, pointId: number, recordingId: string, at: Date, by: string): Promise<number> {
  const cleared = await tx`
    update alarms set cleared_at = ${at}, cleared_by = ${by}
    where point_id = ${pointId} and recording_id = ${recordingId} and cleared_at is null`;
  return cleared.count;
}
