import { it } from 'vitest';
import { seedDemo } from '../../services/api/src/demo-seed.js';
import { bootstrap } from '../../services/api/src/bootstrap.js';
import { startTestService, targets, auth } from './harness.js';

it('demo timing', async () => {
  const svc = await startTestService(targets[0]!);
  const boot = await bootstrap(svc.db.sql, { adminKey: 'admin-key-for-the-demo-test', siteName: 'demo' });
  const t = Date.now();
  const keys = await seedDemo(svc.app, svc.db.sql, boot.siteId, { adminKey: 'admin-key-for-the-demo-test' });
  console.log('seed s', (Date.now() - t) / 1000, keys.recordings);
  const h = auth(keys.engineer);
  const get = async (u: string) => (await svc.app.inject({ method: 'GET', url: u, headers: h })).json();
  console.log(JSON.stringify(await get('/api/v1/machines'), null, 1));
  console.log(JSON.stringify(await get('/api/v1/alarms?state=all'), null, 1).slice(0, 3000));
  for (const [m, p] of [['skelmere-conveyor-drive-2', 'gb-input-h'], ['skelmere-id-fan-1', 'fan-de-h'], ['skelmere-feed-pump-3', 'pump-de-h']]) {
    const recs = await get(`/api/v1/machines/${m}/points/${p}/recordings?limit=30`);
    console.log(m, p, recs.map((r: any) => `${r.recordedAt.slice(5, 10)} ${r.velocityRmsMmPerS?.toFixed(2)} ${r.zone} ${r.topHypothesis?.fault}:${r.topHypothesis?.component}:${r.topHypothesis?.score}`).join('\n'));
  }
  console.log(JSON.stringify(await get('/api/v1/fleet/ranking?weeks=8')));
  await svc.close();
}, 600_000);
