-- Retention of raw samples (KINESPEC_SAMPLE_RETENTION_DAYS): after that many days a recording's samples are
-- dropped (emptied, not the row); its analyses, trend values and alarms stay. samples_purged_at says when.
alter table recordings add column samples_purged_at timestamptz;
create index recordings_retention on recordings (recorded_at) where samples_purged_at is null;
