-- Re-analysis of a machine as jobs of the analysis queue, with progress: one row per request (the model
-- version it analyses against, how many recordings, how far), one item per recording done or failed, so a
-- job repeated after its worker died counts once.
create table reanalyses (
  id             uuid primary key default gen_random_uuid(),
  machine_id     integer not null references machines (id) on delete cascade,
  model_version  integer not null,
  total          integer not null,
  created_by     uuid references api_keys (id) on delete set null,
  created_at     timestamptz not null default now(),
  finished_at    timestamptz
);
create table reanalysis_items (
  reanalysis_id  uuid not null references reanalyses (id) on delete cascade,
  recording_id   uuid not null references recordings (id) on delete cascade,
  -- null when analysed, else why the recording could not be
  failure        text,
  done_at        timestamptz not null default now(),
  primary key (reanalysis_id, recording_id)
);
