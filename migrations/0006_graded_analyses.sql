-- Grade once, in the analysis: the alarm state and the alarm and trip levels the analysis graded the overall
-- velocity with are stored beside its zone, and the alarms and trends read them (no second grading from the
-- point's columns). Earlier analyses take them from their stored result.
alter table analyses add column alarm_state text check (alarm_state in ('normal', 'alarm', 'trip'));
alter table analyses add column alarm_level_mm_per_s double precision;
alter table analyses add column trip_level_mm_per_s double precision;
update analyses set
  alarm_state = case when result->'overall'->>'alarmState' in ('normal', 'alarm', 'trip') then result->'overall'->>'alarmState' end,
  alarm_level_mm_per_s = (result->'overall'->>'alarmLevelMmPerS')::double precision,
  trip_level_mm_per_s = (result->'overall'->>'tripLevelMmPerS')::double precision;
