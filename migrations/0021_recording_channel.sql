-- The channel of a recording the analysis reads, numbered from 1 as people count channels; null lets the
-- analysis choose (the first channel that is not a tach or encoder). Re-analyses read the same channel.
alter table recordings add column analysis_channel smallint check (analysis_channel >= 1);
