-- Raw float32 samples hardly compress (the low bits of the mantissa are noise), so PostgreSQL's
-- TOAST compression only costs CPU on every upload: store them out of line, uncompressed.
alter table recordings alter column samples set storage external;
