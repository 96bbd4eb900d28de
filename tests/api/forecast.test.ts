import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { auth, makeSite, startTestService, targets, type TestService, type TestSite } from './harness.js';
import { accelerationWithVelocityRms, MACHINE, modelText, POINT } from './fixtures.js';

/*
 * Forecasts through HTTP on a series whose crossing is known in closed form. The model is ISO 10816-3 group 2 on
 * a rigid foundation: zone boundaries 1.4 / 2.8 / 4.5 mm/s, so ALARM = 2.8 and TRIP = 4.5 without point levels.
 * One recording a day: r.m.s. velocity 1.0 mm/s for 20 days, then 1.0 × e^(0.05·(day − 20)); its lasting level
 * reaches 1.4 at day 26.7, 2.8 at day 40.6 and 4.5 at day 50.1 (ln(level)/0.05 after day 20). The forecast is
 * made after day 35, so zone C is 5.6 days ahead, zone D 15.1 days.
 */

const DAY_MS = 86_400_000;
// 40 days before today, so that the fleet (which forecasts from the year before now) sees the series
const START = Math.floor((Date.now() - 40 * DAY_MS) / DAY_MS) * DAY_MS + 6 * 3_600_000;
const DAYS = 36;
const velocityOfDay = (d: number) => (d <= 20 ? 1 : Math.exp(0.05 * (d - 20)));

const target = targets[0]!;
describe(`trend forecasts on ${target.name}`, () => {
  let svc: TestService;
  let site: TestSite;
  const get = async (url: string) => {
    const res = await svc.app.inject({ method: 'GET', url, headers: auth(site.keys.engineer) });
    expect(res.statusCode, res.body).toBe(200);
    return res.json();
  };

  beforeAll(async () => {
    svc = await startTestService(target);
    site = await makeSite(svc.db, 'forecast');
    const put = await svc.app.inject({ method: 'PUT', url: `/api/v1/machines/${MACHINE}/model?validFrom=${new Date(START - DAY_MS).toISOString()}`, headers: { ...auth(site.keys.admin), 'content-type': 'application/json' }, payload: modelText });
    expect(put.statusCode).toBe(200);
    for (let d = 0; d < DAYS; d++) {
      const at = new Date(START + d * DAY_MS).toISOString();
      const res = await svc.app.inject({
        method: 'POST',
        url: `/api/v1/machines/${MACHINE}/points/${POINT}/recordings?recordedAt=${at}&unit=m/s%5E2`,
        // the flat days send the same bytes: an Idempotency-Key per day says they are distinct recordings
        headers: { ...auth(site.keys.logger), 'content-type': 'audio/wav', 'idempotency-key': `forecast-day-${d}` },
        payload: accelerationWithVelocityRms(velocityOfDay(d)),
      });
      expect(res.statusCode, res.body).toBe(201);
    }
  }, 300_000);
  afterAll(async () => svc?.close());

  const to = new Date(START + DAYS * DAY_MS).toISOString();

  it("answers the forecast against the point's zone boundaries, alarm and trip levels, and a value given", async () => {
    const t = await get(`/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=day&to=${to}&threshold=3.5`);
    const f = t.forecast;
    expect(f.values).toBe(DAYS);
    expect(f.forecasts.map((x: { level: string }) => x.level)).toEqual(['zone B', 'zone C', 'zone D', 'alarm', 'trip', 'value']);
    const by = Object.fromEntries(f.forecasts.map((x: { level: string }) => [x.level, x]));
    expect(by['zone B'].status).toBe('crossed');
    expect(by['zone C']).toMatchObject({ status: 'crossing', threshold: 2.8 });
    // closed form: 20 + ln(2.8)/0.05 − 35 = 5.59 days; ln(4.5)/0.05 + 20 − 35 = 15.08 days; ln(3.5)/0.05 + 20 − 35 = 10.05 days
    expect(by['zone C'].remainingS / DAY_MS * 1000).toBeCloseTo(5.59, 0);
    expect(by.trip.remainingS / DAY_MS * 1000).toBeCloseTo(15.08, 0);
    expect(by.value.remainingS / DAY_MS * 1000).toBeCloseTo(10.05, 0);
    expect(by['zone C'].lowS).toBeLessThanOrEqual(by['zone C'].remainingS);
    expect(by.alarm.threshold).toBe(2.8);
    // the rise began on day 20 (Page's change point: the last value at the healthy level)
    expect(Math.abs(Date.parse(f.onsetAt) - (START + 20 * DAY_MS)) / DAY_MS).toBeLessThanOrEqual(2);
    expect(f.method).toMatch(/Gebraeel/);
  });

  it('says no crossing is foreseen while the series is flat', async () => {
    const early = new Date(START + 18 * DAY_MS).toISOString();
    const t = await get(`/api/v1/trends?machine=${MACHINE}&point=${POINT}&bucket=day&to=${early}`);
    for (const f of t.forecast.forecasts) expect(f.status).toBe('no-crossing');
  });

  it("shows the machine's soonest foreseen crossing in the fleet", async () => {
    const machines = await get('/api/v1/machines');
    const m = machines.find((x: { id: string }) => x.id === MACHINE);
    // the newest value is from day 35, before now: the forecast is made from it
    expect(m.soonestCrossing).toMatchObject({ pointId: POINT, indicator: 'velocity_rms_mm_per_s', unit: 'mm/s', level: 'zone C', threshold: 2.8 });
  });

  it('gives tach and encoder points no velocity alarm or trip levels', async () => {
    const m = await get(`/api/v1/machines/${MACHINE}`);
    for (const p of m.points) {
      if (p.quantity === 'tach' || p.quantity === 'encoder') expect([p.alarmLevel, p.tripLevel], p.id).toEqual([null, null]);
      else expect(p.alarmLevel, p.id).not.toBeNull();
    }
    expect(m.points.some((p: { quantity: string }) => p.quantity === 'tach' || p.quantity === 'encoder')).toBe(true);
  });
});
