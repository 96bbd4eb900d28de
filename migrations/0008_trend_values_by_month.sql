-- trend_values partitioned by month of recorded_at (PostgreSQL declarative range partitioning): a month of
-- values is one table, so a year's trend query reads twelve small indexes and old months can be detached or
-- dropped whole. The queries do not change. Months from the oldest value to two years ahead are created
-- here; later ones by the service before it writes a month's first value (store.ts ensureTrendMonth);
-- a value no month partition takes lands in trend_values_default.
alter table trend_values rename to trend_values_unpartitioned;
alter index trend_values_series rename to trend_values_unpartitioned_series;
alter index trend_values_recording rename to trend_values_unpartitioned_recording;

create table trend_values (
  point_id      integer not null references points (id) on delete cascade,
  indicator     text not null,
  recorded_at   timestamptz not null,
  recording_id  uuid not null references recordings (id) on delete cascade,
  analysis_id   uuid not null,
  value         double precision not null
) partition by range (recorded_at);
create table trend_values_default partition of trend_values default;

do $$
declare
  m date;
begin
  for m in
    select generate_series(
      date_trunc('month', coalesce((select min(recorded_at) from trend_values_unpartitioned), now()) at time zone 'UTC')::date,
      (date_trunc('month', now() at time zone 'UTC') + interval '24 months')::date,
      interval '1 month')::date
  loop
    execute format('create table %I partition of trend_values for values from (%L) to (%L)',
      'trend_values_' || to_char(m, 'YYYY_MM'), (m::timestamp at time zone 'UTC'), ((m + interval '1 month')::timestamp at time zone 'UTC'));
  end loop;
end $$;

-- the same indexes as before, on every partition
create unique index trend_values_series on trend_values (point_id, indicator, recorded_at, recording_id) include (value);
create index trend_values_recording on trend_values (recording_id);

insert into trend_values (point_id, indicator, recorded_at, recording_id, analysis_id, value)
select point_id, indicator, recorded_at, recording_id, analysis_id, value from trend_values_unpartitioned;
drop table trend_values_unpartitioned;
