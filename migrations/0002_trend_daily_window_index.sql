-- The fleet ranking and the machine list read a few days of one indicator for every point of a site.
-- A covering index in (indicator, day, point_id) order makes each window one index-only range scan
-- instead of a walk through every point's whole year (measured in bench/trends.bench.ts).
drop index if exists trend_daily_indicator_day;
create index trend_daily_window on trend_daily (indicator, day, point_id) include (sum, count);
