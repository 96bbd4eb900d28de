-- Kinespec store, first schema. Runs unchanged on PostgreSQL (13+) and on PGlite.
-- Times are timestamptz (UTC); engineering units are in column names (velocity_rms_mm_per_s).

create table sites (
  id          uuid primary key default gen_random_uuid(),
  name        text not null,
  created_at  timestamptz not null default now()
);

-- API keys: only the SHA-256 of a key is stored; the key itself is shown once.
create table api_keys (
  id          uuid primary key default gen_random_uuid(),
  site_id     uuid not null references sites (id) on delete cascade,
  role        text not null check (role in ('logger', 'engineer', 'admin')),
  label       text not null default '',
  key_hash    bytea not null unique,
  created_at  timestamptz not null default now(),
  revoked_at  timestamptz
);

create table machines (
  id                     integer generated always as identity primary key,
  site_id                uuid not null references sites (id) on delete cascade,
  -- the id used in URLs and in the machine model file ("aeration-mixer-2")
  machine_key            text not null,
  name                   text not null,
  current_model_version  integer,
  created_at             timestamptz not null default now(),
  unique (site_id, machine_key)
);

-- Every version of a machine's model file is kept: analyses name the version they used.
create table machine_models (
  machine_id   integer not null references machines (id) on delete cascade,
  version      integer not null,
  model        jsonb not null,
  source_text  text not null,
  -- a recording taken at or after valid_from (and before the next version's) is analysed against this version
  valid_from   timestamptz not null default now(),
  created_at   timestamptz not null default now(),
  created_by   uuid references api_keys (id) on delete set null,
  primary key (machine_id, version)
);

create table points (
  id                              integer generated always as identity primary key,
  machine_id                      integer not null references machines (id) on delete cascade,
  point_key                       text not null,
  quantity                        text not null,
  unit                            text,
  near                            text,
  shaft                           text,
  direction                       text,
  alarm_velocity_rms_mm_per_s     double precision,
  trip_velocity_rms_mm_per_s      double precision,
  baseline_velocity_rms_mm_per_s  double precision,
  iso_group                       smallint,
  iso_foundation                  text,
  -- set when a newer model version no longer lists the point; its history stays
  retired_at                      timestamptz,
  unique (machine_id, point_key)
);

create table recordings (
  id               uuid primary key default gen_random_uuid(),
  site_id          uuid not null references sites (id) on delete cascade,
  point_id         integer not null references points (id) on delete cascade,
  recorded_at      timestamptz not null,
  received_at      timestamptz not null default now(),
  sample_rate_hz   double precision not null,
  sample_count     integer not null,
  -- [{ name, unit }] per channel, in the order the samples are stored
  channels         jsonb not null,
  -- float32 little-endian, channel after channel (4 bytes x sample_count x channels)
  samples          bytea not null,
  -- SHA-256 of the uploaded bytes (the file part of a multipart form)
  content_hash     bytea not null,
  idempotency_key  text,
  source_format    text not null,
  speed_rpm        double precision,
  metadata         jsonb not null default '{}'::jsonb,
  uploaded_by      uuid references api_keys (id) on delete set null
);
create unique index recordings_idempotency on recordings (site_id, idempotency_key) where idempotency_key is not null;
create unique index recordings_content on recordings (point_id, content_hash) where idempotency_key is null;
create index recordings_point_time on recordings (point_id, recorded_at desc);

-- Many analyses per recording (one per model version and software version); exactly one is current.
create table analyses (
  id                      uuid primary key default gen_random_uuid(),
  recording_id            uuid not null references recordings (id) on delete cascade,
  model_version           integer,
  software_version        text not null,
  is_current              boolean not null default true,
  created_at              timestamptz not null default now(),
  speed_hz                double precision,
  speed_source            text,
  velocity_rms_mm_per_s   double precision,
  zone                    text check (zone in ('A', 'B', 'C', 'D')),
  -- { fault, component, score, reason } of the best hypothesis, for lists
  top_hypothesis          jsonb,
  -- the RecordingAnalysis object as produced, spectrum downsampled for plotting
  result                  jsonb not null
);
create unique index analyses_current on analyses (recording_id) where is_current;
create index analyses_recording on analyses (recording_id, created_at);

-- One row per recording, point and indicator, from the recording's current analysis.
create table trend_values (
  point_id      integer not null references points (id) on delete cascade,
  indicator     text not null,
  recorded_at   timestamptz not null,
  recording_id  uuid not null references recordings (id) on delete cascade,
  analysis_id   uuid not null,
  value         double precision not null
);
-- serves every trend query as an index-only range scan of one series
create unique index trend_values_series on trend_values (point_id, indicator, recorded_at, recording_id) include (value);
create index trend_values_recording on trend_values (recording_id);

-- Daily roll-up of trend_values (UTC days), kept in the same transaction as the values;
-- the fleet ranking and the machine list read it instead of every value.
create table trend_daily (
  point_id    integer not null references points (id) on delete cascade,
  indicator   text not null,
  day         date not null,
  count       integer not null,
  sum         double precision not null,
  min         double precision not null,
  max         double precision not null,
  last_value  double precision not null,
  last_at     timestamptz not null,
  primary key (point_id, indicator, day)
);
create index trend_daily_indicator_day on trend_daily (indicator, day);

create table alarms (
  id               uuid primary key default gen_random_uuid(),
  site_id          uuid not null references sites (id) on delete cascade,
  point_id         integer not null references points (id) on delete cascade,
  indicator        text not null,
  level            text not null check (level in ('alarm', 'trip')),
  value            double precision not null,
  threshold        double precision not null,
  recording_id     uuid references recordings (id) on delete set null,
  raised_at        timestamptz not null,
  acknowledged_at  timestamptz,
  acknowledged_by  text,
  cleared_at       timestamptz,
  cleared_by       text
);
-- at most one open alarm per point and indicator
create unique index alarms_open on alarms (point_id, indicator) where cleared_at is null;
create index alarms_site on alarms (site_id, raised_at desc);
