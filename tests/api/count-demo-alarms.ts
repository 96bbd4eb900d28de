// Counts the alarms the demo raises and clears over its twelve weeks (issue 10: "alarms no longer chatter on the
// demo; count raise/clear pairs before and after"). A script, not a test (a full demo seed takes minutes):
//   node --import tsx tests/api/count-demo-alarms.ts
// Seeds the whole demo through the real upload path into an in-memory PGlite and prints, per indicator family,
// how many alarms were raised, how many of them were cleared again (a raise/clear pair), and how many stay open.
import { bootstrap } from '../../services/api/src/bootstrap.js';
import { seedDemo } from '../../services/api/src/demo-seed.js';
import { startTestService, targets } from './harness.js';

const ADMIN = 'count-demo-alarms-admin-key-0123456789';
const svc = await startTestService(targets[0]!);
try {
  const boot = await bootstrap(svc.db.sql, { adminKey: ADMIN, siteName: 'demo' });
  const t0 = performance.now();
  const keys = await seedDemo(svc.app, svc.db.sql, boot.siteId, { adminKey: ADMIN, now: new Date('2025-06-30T12:00:00Z') });
  const rows = await svc.db.sql<Array<{ family: string; raised: number; cleared: number; open: number }>>`
    select case when indicator like 'score:%' then 'fault scores' else indicator end as family,
      count(*)::int as raised, count(cleared_at)::int as cleared, (count(*) - count(cleared_at))::int as open
    from alarms group by 1 order by 1`;
  console.log(`demo: ${keys.recordings} recordings seeded in ${((performance.now() - t0) / 1000).toFixed(0)} s`);
  for (const r of rows) console.log(`  ${r.family.padEnd(24)} raised ${String(r.raised).padStart(3)}  raise/clear pairs ${String(r.cleared).padStart(3)}  open ${String(r.open).padStart(3)}`);
  const total = rows.reduce((a, r) => ({ raised: a.raised + r.raised, cleared: a.cleared + r.cleared }), { raised: 0, cleared: 0 });
  console.log(`  ${'all'.padEnd(24)} raised ${String(total.raised).padStart(3)}  raise/clear pairs ${String(total.cleared).padStart(3)}`);
  // how much a fault score moves from one recording to the next near the alarm level (the deadband's reason)
  const steps = await svc.db.sql<Array<{ step: number }>>`
    select abs(value - lag(value) over (partition by point_id, indicator order by recorded_at)) as step
    from trend_values where indicator like 'score:%'`;
  const series = await svc.db.sql<Array<{ point_id: number; indicator: string; value: number }>>`
    select point_id, indicator, value from trend_values where indicator like 'score:%' order by point_id, indicator, recorded_at`;
  const near: number[] = [];
  for (let i = 1; i < series.length; i++) {
    const a = series[i - 1]!;
    const b = series[i]!;
    if (a.point_id === b.point_id && a.indicator === b.indicator && a.value >= 0.3 && a.value <= 0.7) near.push(Math.abs(b.value - a.value));
  }
  near.sort((x, y) => x - y);
  const q = (p: number) => near[Math.min(near.length - 1, Math.floor(p * near.length))] ?? NaN;
  console.log(`  fault scores between 0.3 and 0.7: ${near.length} steps to the next recording, median ${q(0.5).toFixed(3)}, 75 % ${q(0.75).toFixed(3)}, 90 % ${q(0.9).toFixed(3)} (all scores: ${steps.length} values)`);
} finally {
  await svc.close();
}
