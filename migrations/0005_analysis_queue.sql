-- Analysis off the request path: a recording is stored first, its analysis is a job of the PostgreSQL queue
-- (pg-boss, schema pgboss, created by the library itself). analysis_state says where the recording stands:
-- 'queued' until a worker stores its analysis ('done') or finds it cannot be analysed ('failed', with the
-- problem an upload would have answered in analysis_problem). Recordings stored before this are 'done'.
alter table recordings add column analysis_state text not null default 'done'
  check (analysis_state in ('queued', 'done', 'failed'));
alter table recordings add column analysis_problem jsonb;
create index recordings_not_analysed on recordings (received_at) where analysis_state <> 'done';
