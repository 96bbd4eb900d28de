-- Keys: when each was last used (kept to the minute, written at most once a minute per key), which key a
-- rotation replaced, and a 'platform' role that may create sites (off unless KINESPEC_PLATFORM_KEY is set).
alter table api_keys add column last_used_at timestamptz;
alter table api_keys add column replaced_by uuid references api_keys (id) on delete set null;
alter table api_keys drop constraint api_keys_role_check;
alter table api_keys add constraint api_keys_role_check check (role in ('logger', 'engineer', 'admin', 'platform'));
create index api_keys_site on api_keys (site_id, created_at);
