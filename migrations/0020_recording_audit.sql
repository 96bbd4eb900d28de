-- Corrections of recordings: a recording deleted because it was uploaded by mistake, or moved to the point or
-- time it really belongs to. One row per correction, kept after the recording itself is gone (no foreign key
-- to recordings), so the log says who changed what, when and why.
create table recording_audit (
  id            bigint generated always as identity primary key,
  site_id       uuid not null references sites (id) on delete cascade,
  recording_id  uuid not null,
  action        text not null check (action in ('delete', 'move')),
  at            timestamptz not null default now(),
  -- the key that made the change, and its label and role at the time (the key may be revoked later)
  by_key_id     uuid references api_keys (id) on delete set null,
  by_name       text not null,
  reason        text not null default '',
  -- { machineId, pointId, recordedAt, contentSha256, sourceFormat, sampleCount, sampleRateHz, zone, velocityRmsMmPerS }
  before        jsonb not null,
  -- moves: { machineId, pointId, recordedAt }; deletes: null
  after         jsonb
);
create index recording_audit_site on recording_audit (site_id, at desc);
create index recording_audit_recording on recording_audit (recording_id, at);
