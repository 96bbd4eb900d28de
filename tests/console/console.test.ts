import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { build } from 'vite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startConsoleService, type ConsoleService } from './console-service.js';
import { inkedPixels, tabStops, unlabelledControls } from './page-checks.js';
import { floatWav, pcm16Wav, sines } from './wav-file.js';

// The web console in a real browser: Debian's Chromium driven by playwright-core, against the
// service started in-process. Chart state is read from the charts' data attributes, so the checks
// do not depend on pixels (one check only asks that the canvas is not blank).

const chromiumPath = '/usr/bin/chromium';
const hasChromium = existsSync(chromiumPath);
const root = fileURLToPath(new URL('../../', import.meta.url));
const shots = join(root, 'test-output', 'screenshots');

interface MachineRow {
  id: string;
  name: string;
  topHypothesis: { fault: string; component: string; score: number } | null;
}
interface AnalysisJson {
  hypotheses: Array<{ fault: string; component: string; domain: string; evidence: Array<{ frequencyHz: number; matched: boolean }> }>;
}

describe.skipIf(!hasChromium)('web console in Chromium', () => {
  let service: ConsoleService;
  let context: BrowserContext;
  let page: Page;
  let outDir: string;
  let userDataDir: string;
  const pageErrors: string[] = [];
  const failedRequests: string[] = [];

  /**
   * Screenshots of the page as it is now at the two sizes the console is made for, 1280 × 800 (a laptop) and
   * 800 × 1024 (a tablet), first screen only: what a user sees without scrolling. Then back to 1280 × 800.
   */
  async function shoot(name: string): Promise<void> {
    for (const [width, height] of [[1280, 800], [800, 1024]] as const) {
      await page.setViewportSize({ width, height });
      await page.evaluate(() => window.scrollTo(0, 0));
      await page.waitForTimeout(400);
      await page.screenshot({ path: join(shots, `${name}-${width}x${height}.png`) });
    }
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.waitForTimeout(200);
  }

  // Seeding the demo site (twelve weeks of recordings through the real pipeline) takes minutes.
  beforeAll(async () => {
    mkdirSync(shots, { recursive: true });
    outDir = mkdtempSync(join(tmpdir(), 'kinespec-console-'));
    userDataDir = mkdtempSync(join(tmpdir(), 'kinespec-chromium-'));
    await build({ configFile: join(root, 'services/console/vite.config.ts'), logLevel: 'silent', build: { outDir, emptyOutDir: true, sourcemap: false } });
    service = await startConsoleService(outDir);
    // an empty, throw-away profile: no state leaks between runs
    context = await chromium.launchPersistentContext(userDataDir, {
      executablePath: chromiumPath,
      headless: true,
      args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run'],
      viewport: { width: 1280, height: 800 },
    });
    page = context.pages()[0] ?? (await context.newPage());
    page.on('pageerror', (err) => pageErrors.push(err.message));
    // a request that fails is a defect (a missing favicon, a stale bundle), except the key form's deliberate 401
    page.on('response', (r) => {
      if (r.status() >= 400 && !(r.status() === 401 && r.url().includes('/api/v1/site'))) failedRequests.push(`${r.status()} ${r.url()}`);
    });
  }, 900_000);

  afterAll(async () => {
    await context?.close();
    await service?.close();
    for (const dir of [outDir, userDataDir]) if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('asks for the API key with a labelled form and opens the fleet once it is accepted', async () => {
    await page.goto(service.url);
    const keyInput = page.getByLabel('API key');
    await keyInput.waitFor();
    expect(await unlabelledControls(page)).toEqual([]);
    await shoot('key-form');
    await keyInput.fill('not-a-key');
    await page.getByRole('button', { name: 'Open console' }).click();
    await page.getByRole('alert').waitFor();
    expect(await page.getByRole('alert').textContent()).toMatch(/does not know this key/);
    await keyInput.fill(service.key);
    await page.getByRole('button', { name: 'Open console' }).click();
    await page.locator('#fleet-table tbody tr[data-machine-id]').first().waitFor();
    expect(await page.evaluate(() => sessionStorage.getItem('kinespec.apiKey'))).toBe(service.key);
  });

  it('lists every machine of the site, the most concerning first', async () => {
    const machines = await service.get<MachineRow[]>('/api/v1/machines');
    const rows = page.locator('#fleet-table tbody tr[data-machine-id]');
    expect(await rows.count()).toBe(machines.length);
    const concerns = await rows.evaluateAll((trs) => trs.map((tr) => Number((tr as HTMLElement).dataset.concern)));
    expect(concerns).toEqual([...concerns].sort((a, b) => b - a));
    // every machine with a fault hypothesis of 0.5 or more is flagged in its row
    for (const m of machines.filter((x) => (x.topHypothesis?.score ?? 0) >= 0.5)) {
      await expect.poll(() => page.locator(`tr[data-machine-id="${m.id}"] .fault-flag`).count()).toBe(1);
    }
    expect(await page.locator('#fleet-table .sparkline').count()).toBeGreaterThan(0);
    await shoot('fleet');
  });

  it('sorts by a column and filters to fault hypotheses', async () => {
    await page.locator('button[data-sort="name"]').click();
    const names = await page.locator('#fleet-table tbody tr[data-machine-id] .machine-link').allTextContents();
    expect(names).toEqual([...names].sort((a, b) => a.localeCompare(b)));
    expect(await page.locator('th:has(button[data-sort="name"])').getAttribute('aria-sort')).toBe('ascending');
    await page.getByLabel(/Only fault hypotheses/).check();
    const flagged = await page.locator('#fleet-table tbody tr[data-machine-id]').count();
    expect(await page.locator('#fleet-table tbody tr[data-machine-id] .fault-flag').count()).toBe(flagged);
    await page.getByLabel(/Only fault hypotheses/).uncheck();
    await page.locator('button[data-sort="concern"]').click();
  });

  it('labels every fleet control and reaches the main ones with Tab', async () => {
    expect(await unlabelledControls(page)).toEqual([]);
    const stops = await tabStops(page, 16);
    for (const want of ['#fleet-filter', '#fleet-zone', '#fleet-faults', 'sort:concern', 'sort:name']) expect(stops).toContain(want);
    expect(stops.some((s) => s.startsWith('a:') && s !== 'a:Skip to content')).toBe(true);
  });

  it('opens the machine with the strongest fault hypothesis and draws its predicted lines on the spectrum', async () => {
    const machines = await service.get<MachineRow[]>('/api/v1/machines');
    const target = [...machines].sort((a, b) => (b.topHypothesis?.score ?? 0) - (a.topHypothesis?.score ?? 0))[0]!;
    await page.locator(`tr[data-machine-id="${target.id}"] a.machine-link`).click();
    const analysis = page.locator('.analysis[data-analysis-id]');
    await analysis.waitFor();
    const recordingId = (await analysis.getAttribute('data-recording-id'))!;
    const api = await service.get<AnalysisJson>(`/api/v1/recordings/${encodeURIComponent(recordingId)}/analysis`);
    const top = api.hypotheses[0]!;
    expect(await analysis.getAttribute('data-top-hypothesis')).toBe(`${top.fault}:${top.component}`);

    // the chart of the top hypothesis's domain carries its lines: same frequencies as the evidence
    const kind = top.domain === 'envelope' ? 'envelope' : top.domain === 'order' ? 'order' : 'spectrum';
    const chart = page.locator(`figure[data-chart="${kind}"]`);
    await expect.poll(async () => Number(await chart.getAttribute('data-drawn'))).toBeGreaterThan(0);
    expect(await chart.getAttribute('data-hypothesis')).toBe(`${top.fault}:${top.component}`);
    const drawn = JSON.parse((await chart.getAttribute('data-predicted-lines'))!) as Array<{ frequencyHz: number; matched: boolean }>;
    expect(drawn.map((l) => l.frequencyHz)).toEqual(top.evidence.map((e) => e.frequencyHz).sort((a, b) => a - b));
    expect(Number(await chart.getAttribute('data-matched-count'))).toBe(top.evidence.filter((e) => e.matched).length);
    expect(Number(await page.locator('figure[data-chart="spectrum"]').getAttribute('data-series-points'))).toBeGreaterThan(1000);
    expect(await inkedPixels(page, 'figure[data-chart="spectrum"]')).toBeGreaterThan(200);
    expect(await page.locator('#evidence-table tbody tr').count()).toBe(top.evidence.length);
    await expect.poll(() => page.locator('figure[data-chart="trend"]').count()).toBeGreaterThan(0);
    expect(await page.getByRole('note', { name: 'Safety note' }).textContent()).toMatch(/qualified engineer.*lock-out/s);
    await page.waitForTimeout(300);
    await shoot('machine-strongest-fault');
    await chart.screenshot({ path: join(shots, `machine-${kind}-chart.png`) });
  });

  it('finds the developing gear tooth fault and the bearing outer-race defect from the machine pages', async () => {
    const machines = await service.get<MachineRow[]>('/api/v1/machines');
    const found = new Map<string, { machineId: string; pointId: string }>();
    for (const m of machines) {
      await page.goto(`${service.url}#/machine/${encodeURIComponent(m.id)}`);
      const panel = page.locator('#developing-panel');
      await expect.poll(() => panel.getAttribute('data-state'), { timeout: 60_000 }).toMatch(/done|failed/);
      expect(await panel.getAttribute('data-state')).toBe('done');
      for (const row of await panel.locator('tr[data-hypothesis]').all()) {
        const fault = (await row.getAttribute('data-hypothesis'))!.split(':')[0]!;
        if (!found.has(fault)) found.set(fault, { machineId: m.id, pointId: (await row.getAttribute('data-point-id'))! });
      }
    }
    const tooth = [...found.keys()].find((f) => f === 'gear-broken-tooth' || f === 'gear-missing-tooth');
    expect(tooth, `developing faults found: ${[...found.keys()].join(', ')}`).toBeDefined();
    expect(found.has('bearing-outer-race'), `developing faults found: ${[...found.keys()].join(', ')}`).toBe(true);

    // following the panel's link draws that hypothesis's lines on its spectrum
    const at = found.get(tooth!)!;
    await page.goto(`${service.url}#/machine/${encodeURIComponent(at.machineId)}`);
    const row = page.locator(`#developing-panel tr[data-hypothesis^="${tooth}:"][data-point-id="${at.pointId}"]`).first();
    await row.waitFor({ timeout: 60_000 });
    const key = (await row.getAttribute('data-hypothesis'))!;
    await row.getByRole('link', { name: 'show on the spectrum' }).click();
    await expect.poll(() => page.locator('figure[data-chart="spectrum"]').getAttribute('data-hypothesis'), { timeout: 30_000 }).toBe(key);
    expect(Number(await page.locator('figure[data-chart="spectrum"]').getAttribute('data-predicted-count'))).toBeGreaterThan(0);
    await page.waitForTimeout(300);
    await shoot('machine-developing-gear-fault');
  });

  it('zooms with the keyboard and switches to a log amplitude axis', async () => {
    const chart = page.locator('figure[data-chart="spectrum"]');
    const before = Number(await chart.getAttribute('data-x-max'));
    await chart.locator('.plot').focus();
    await page.keyboard.press('+');
    await expect.poll(async () => Number(await chart.getAttribute('data-x-max'))).toBeLessThan(before);
    await page.getByLabel('log', { exact: true }).first().check();
    await expect.poll(() => page.locator('figure[data-chart="spectrum"]').getAttribute('data-log-y')).toBe('true');
    // the zoomed range survives the rebuild
    expect(Number(await page.locator('figure[data-chart="spectrum"]').getAttribute('data-x-max'))).toBeLessThan(before);
  });

  it('labels every machine-page control and reaches the point, recording and chart controls with Tab', async () => {
    expect(await unlabelledControls(page)).toEqual([]);
    const stops = await tabStops(page, 60);
    for (const prefix of ['#point-', '#recording-', '#draw-select-', '#amplitude-scale-', 'button:Zoom in', '#hyp-']) {
      expect(stops.some((s) => s.startsWith(prefix)), `Tab reaches ${prefix}`).toBe(true);
    }
  });

  it('shows the predicted signature of the suspected fault with its magnification and Campbell data', async () => {
    await page.getByRole('link', { name: 'Signatures', exact: true }).click();
    await page.locator('figure[data-chart="signature-lines"]').waitFor();
    const machine = await page.locator('#sig-machine').inputValue();
    const [fault, component] = (await page.locator('#sig-fault').inputValue()).split('|');
    const speedRpm = await page.locator('#sig-speed').inputValue();
    await page.locator('#sig-harmonics').fill('5');
    await page.getByRole('button', { name: 'Show' }).click();
    const query = new URLSearchParams({ machine, fault: fault!, component: component!, speedRpm, harmonics: '5' });
    const sig = await service.get<{ lines: unknown[]; excitation?: { waveform?: number[]; partialSums?: Record<string, number[]> }; campbell?: unknown }>(`/api/v1/signatures?${query}`);
    await expect.poll(() => page.locator('#signature-output').getAttribute('data-harmonics')).toBe('5');
    expect(Number(await page.locator('figure[data-chart="signature-lines"]').getAttribute('data-predicted-count'))).toBe(sig.lines.length);
    // faults with fixed lines (unbalance) have no waveform and so no excitation chart
    if (sig.excitation?.waveform?.length && sig.excitation.partialSums) {
      expect((await page.locator('figure[data-chart="excitation"]').getAttribute('data-partial-sums'))!.split(',')).toEqual(Object.keys(sig.excitation.partialSums).sort((a, b) => Number(a) - Number(b)));
    } else {
      expect(await page.locator('figure[data-chart="excitation"]').count()).toBe(0);
    }
    if (sig.campbell) expect(Number(await page.locator('figure[data-chart="campbell"]').getAttribute('data-orders'))).toBeGreaterThan(0);
    expect(await unlabelledControls(page)).toEqual([]);
    await page.waitForTimeout(200);
    await shoot('signatures');
  });

  it('plots the excitation of a tooth fault with its partial sums, each with its own dash, and re-requests for a new number of harmonics', async () => {
    // a machine of the demo with a tooth-fault candidate (a gearbox), chosen through the page's own selects
    const machines = await service.get<MachineRow[]>('/api/v1/machines');
    let choice: { machine: string; value: string } | null = null;
    for (const m of machines) {
      const faults = await service.get<Array<{ fault: string; component: string }>>(`/api/v1/faults?machine=${encodeURIComponent(m.id)}`);
      const tooth = faults.find((f) => f.fault === 'gear-missing-tooth');
      if (tooth) {
        choice = { machine: m.id, value: `${tooth.fault}|${tooth.component}` };
        break;
      }
    }
    expect(choice, 'the demo site has a gearbox').not.toBeNull();
    await page.locator('#sig-machine').selectOption(choice!.machine);
    await page.locator(`#sig-fault option[value="${choice!.value}"]`).waitFor({ state: 'attached' });
    await page.locator('#sig-fault').selectOption(choice!.value);
    await page.locator('#sig-harmonics').fill('12');
    await page.getByRole('button', { name: 'Show' }).click();
    const excitation = page.locator('figure[data-chart="excitation"]');
    await expect.poll(() => excitation.getAttribute('data-harmonics')).toBe('12');
    const [fault, component] = choice!.value.split('|');
    const query = new URLSearchParams({ machine: choice!.machine, fault: fault!, component: component!, speedRpm: await page.locator('#sig-speed').inputValue(), harmonics: '12' });
    const sig = await service.get<{ excitation: { angleRev: number[]; waveform: number[]; partialSums: Record<string, number[]> } }>(`/api/v1/signatures?${query}`);
    // the exact waveform over one period, then one series per partial sum the service sent (12 among them)
    expect(sig.excitation.waveform.length).toBeGreaterThan(0);
    expect(Number(await excitation.getAttribute('data-waveform-points'))).toBe(sig.excitation.waveform.length);
    expect(Number(await excitation.getAttribute('data-series-points'))).toBe(sig.excitation.angleRev.length);
    const sums = (await excitation.getAttribute('data-partial-sums'))!.split(',');
    expect(sums.length).toBeGreaterThanOrEqual(2);
    expect(sums).toContain('12');
    expect(sums).toEqual(Object.keys(sig.excitation.partialSums).sort((a, b) => Number(a) - Number(b)));
    expect(Number(await excitation.getAttribute('data-series'))).toBe(1 + sums.length);
    // colour is not the only carrier: every partial sum has a dash pattern of its own, none solid like the waveform
    const dashes = JSON.parse((await excitation.getAttribute('data-partial-sum-dashes'))!) as number[][];
    expect(dashes).toHaveLength(sums.length);
    expect(dashes.every((d) => d.length > 0)).toBe(true);
    expect(new Set(dashes.map((d) => d.join(','))).size).toBe(dashes.length);
    expect(await inkedPixels(page, 'figure[data-chart="excitation"]')).toBeGreaterThan(200);
    expect(Number(await page.locator('figure[data-chart="magnification"]').getAttribute('data-harmonics'))).toBeGreaterThan(0);
    // a new number of harmonics re-requests on change, without pressing Show
    await page.locator('#sig-harmonics').fill('7');
    await page.locator('#sig-harmonics').press('Tab');
    await expect.poll(() => excitation.getAttribute('data-harmonics')).toBe('7');
    expect((await excitation.getAttribute('data-partial-sums'))!.split(',')).toContain('7');
    expect(await page.locator('figure[data-chart="excitation"]').count()).toBe(1);
    expect(await unlabelledControls(page)).toEqual([]);
    await page.waitForTimeout(200);
    await shoot('signatures-excitation');
    await page.screenshot({ path: join(shots, 'signatures-excitation-full.png'), fullPage: true });
  });

  it('uploads a recording through the page and shows its analysis', async () => {
    await page.getByRole('link', { name: 'Upload', exact: true }).click();
    await page.locator('#up-point option').first().waitFor({ state: 'attached' });
    const sampleRateHz = 25600;
    const wav = pcm16Wav(sines([[24.5, 1], [441, 0.3]], sampleRateHz, 65536), sampleRateHz);
    await page.locator('#up-files').setInputFiles({ name: 'field-check.wav', mimeType: 'audio/wav', buffer: wav });
    const item = page.locator('.upload-item[data-file="field-check.wav"]');
    await expect.poll(() => item.getAttribute('data-state'), { timeout: 30_000 }).toBe('done');
    expect(await item.locator('progress').evaluate((p) => (p as HTMLProgressElement).value)).toBe(100);
    expect(await item.locator('.upload-summary[data-analysis-id]').count()).toBe(1);
    expect(await unlabelledControls(page)).toEqual([]);
    const stops = await tabStops(page, 30);
    for (const want of ['#up-machine', '#up-point', '#up-files']) expect(stops, `Tab reaches ${want}`).toContain(want);
    await shoot('upload');

    // the analysis link opens the new recording on the machine page
    const recordingId = await item.getAttribute('data-recording-id');
    expect(recordingId).toBeTruthy();
    await item.getByRole('link', { name: 'open the analysis' }).click();
    await expect.poll(() => page.locator('.analysis').getAttribute('data-recording-id')).toBe(recordingId);
  });

  it('accepts files dropped onto the drop zone', async () => {
    await page.getByRole('link', { name: 'Upload', exact: true }).click();
    await page.locator('#up-point option').first().waitFor({ state: 'attached' });
    const sampleRateHz = 25600;
    const bytes = Array.from(pcm16Wav(sines([[24.5, 1]], sampleRateHz, 32768), sampleRateHz));
    await page.locator('#dropzone').evaluate((zone, data) => {
      const transfer = new DataTransfer();
      for (const name of ['drop-a.wav', 'drop-b.wav']) transfer.items.add(new File([new Uint8Array(data)], name, { type: 'audio/wav' }));
      zone.dispatchEvent(new DragEvent('drop', { dataTransfer: transfer, bubbles: true, cancelable: true }));
    }, bytes);
    for (const name of ['drop-a.wav', 'drop-b.wav']) {
      await expect.poll(() => page.locator(`.upload-item[data-file="${name}"]`).getAttribute('data-state'), { timeout: 30_000 }).toBe('done');
    }
  });

  it('acknowledges an active alarm', async () => {
    const alarms = await service.get<Array<{ id: string; machineId: string; raisedAt: string; acknowledgedAt: string | null; clearedAt: string | null }>>('/api/v1/alarms?state=active');
    const open = alarms.filter((a) => !a.acknowledgedAt && !a.clearedAt).sort((a, b) => b.raisedAt.localeCompare(a.raisedAt))[0];
    if (!open) return expect(alarms.every((a) => a.acknowledgedAt || a.clearedAt)).toBe(true);
    await page.goto(`${service.url}#/machine/${encodeURIComponent(open.machineId)}`);
    const row = page.locator(`tr[data-alarm-id="${open.id}"]`);
    await row.waitFor();
    await row.getByRole('button', { name: /Acknowledge/ }).click();
    await expect.poll(() => page.locator(`tr[data-alarm-id="${open.id}"]`).getAttribute('data-state')).toBe('acknowledged');
  });

  it('lays out at tablet width without horizontal scrolling of the page', async () => {
    await page.setViewportSize({ width: 800, height: 1100 });
    const pages: Array<[string, string | null, string]> = [
      ['fleet', '#/fleet', '#fleet-table tbody tr'],
      ['machine', null, 'figure[data-chart="spectrum"]'],
      ['signatures', '#/signatures', 'figure[data-chart="signature-lines"]'],
      ['upload', '#/upload', '#dropzone'],
    ];
    for (const [name, hash, ready] of pages) {
      if (hash) await page.goto(`${service.url}${hash}`);
      else await page.locator('a.machine-link').first().click();
      await page.locator(ready).first().waitFor();
      await page.waitForTimeout(300);
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow, `${name} page scrolls sideways by ${overflow} px`).toBeLessThanOrEqual(1);
      await page.screenshot({ path: join(shots, `${name}-tablet-full-page.png`), fullPage: true });
    }
    await page.setViewportSize({ width: 1280, height: 800 });
  });

  it('opens a machine on the point whose newest recording is worst, with the proof of its fault above the fold', async () => {
    const machines = await service.get<MachineRow[]>('/api/v1/machines');
    const rank = (z: string | null) => (z ? 'ABCD'.indexOf(z) + 1 : 0);
    for (const m of [...machines].sort((a, b) => (b.topHypothesis?.score ?? 0) - (a.topHypothesis?.score ?? 0)).slice(0, 2)) {
      const detail = await service.get<{ points: Array<{ id: string; quantity: string }> }>(`/api/v1/machines/${encodeURIComponent(m.id)}`);
      const latest: Array<{ id: string; zone: string | null }> = [];
      for (const p of detail.points.filter((q) => q.quantity !== 'tach' && q.quantity !== 'encoder')) {
        const [r] = await service.get<Array<{ zone: string | null }>>(`/api/v1/machines/${encodeURIComponent(m.id)}/points/${encodeURIComponent(p.id)}/recordings?limit=1`);
        if (r) latest.push({ id: p.id, zone: r.zone });
      }
      const worst = Math.max(...latest.map((p) => rank(p.zone)));
      await page.goto(`${service.url}#/machine/${encodeURIComponent(m.id)}`);
      await page.reload();
      const analysis = page.locator('.analysis[data-analysis-id]');
      await analysis.waitFor();
      const chosen = await page.locator('#points input[type=radio]:checked').inputValue();
      expect(rank(latest.find((p) => p.id === chosen)!.zone), `${m.id}: opened on ${chosen}`).toBe(worst);
      // the first chart is the one the drawn hypothesis is judged on, and it ends inside the first 800 pixels
      const first = page.locator('#spectra figure.chart').first();
      const drawn = await first.getAttribute('data-hypothesis');
      expect(drawn, `${m.id}: a hypothesis is drawn on the first chart`).toBeTruthy();
      const box = (await first.boundingBox())!;
      expect(box.y + box.height, `${m.id}: the proof chart ends at ${Math.round(box.y + box.height)} px`).toBeLessThanOrEqual(800);
      expect(Number(await first.getAttribute('data-matched-count'))).toBeGreaterThan(0);
      await shoot(`machine-${m.id}`);
    }
  });

  it('puts a unit in every evidence column and shows the counts the reason uses', async () => {
    const headings = await page.locator('#evidence-table thead th').allTextContents();
    const numeric = headings.filter((t) => !['Line', 'Family', 'Status'].includes(t));
    expect(numeric.length).toBe(5);
    for (const t of numeric) expect(t, 'a numeric column names its unit or scale').toMatch(/\(.+\)/);
    const recordingId = (await page.locator('.analysis').getAttribute('data-recording-id'))!;
    const api = await service.get<{ hypotheses: Array<{ fault: string; component: string; evidence: Array<{ matched: boolean }>; linesMatched?: number; linesPredicted?: number }> }>(`/api/v1/recordings/${recordingId}/analysis`);
    const drawn = (await page.locator('#spectra figure.chart').first().getAttribute('data-hypothesis'))!;
    const h = api.hypotheses.find((x) => `${x.fault}:${x.component}` === drawn)!;
    const counts = page.locator('#evidence-counts');
    expect(Number(await counts.getAttribute('data-matched'))).toBe(h.linesMatched ?? h.evidence.filter((e) => e.matched).length);
    expect(Number(await counts.getAttribute('data-predicted'))).toBe(h.linesPredicted ?? h.evidence.length);
    const row = page.locator(`.hyp-table tr[data-hypothesis="${drawn}"] td.num`);
    expect(await row.textContent()).toBe(`${await counts.getAttribute('data-matched')} of ${await counts.getAttribute('data-predicted')}`);
  });

  it("labels the demo's densest spectrum without one label over another", async () => {
    // the spectrum with the most predicted lines among the strongest hypotheses of every machine's landing page
    const machines = await service.get<MachineRow[]>('/api/v1/machines');
    let densest: { id: string; lines: number } | null = null;
    for (const m of machines) {
      await page.goto(`${service.url}#/machine/${encodeURIComponent(m.id)}`);
      await page.reload();
      await page.locator('.analysis[data-analysis-id]').waitFor();
      const lines = Number(await page.locator('figure[data-chart="spectrum"]').getAttribute('data-predicted-count'));
      if (!densest || lines > densest.lines) densest = { id: m.id, lines };
    }
    await page.goto(`${service.url}#/machine/${encodeURIComponent(densest!.id)}`);
    await page.reload();
    const chart = page.locator('figure[data-chart="spectrum"]');
    await expect.poll(async () => Number(await chart.getAttribute('data-drawn'))).toBeGreaterThan(0);
    expect(densest!.lines).toBeGreaterThan(20);
    const boxes = await chart.locator('.line-label').evaluateAll((els) => els.map((e) => e.getBoundingClientRect()).map((r) => ({ left: r.left, right: r.right, top: r.top, bottom: r.bottom })));
    expect(boxes.length).toBeGreaterThanOrEqual(3);
    expect(boxes.length).toBeLessThanOrEqual(10);
    for (let i = 0; i < boxes.length; i++) {
      for (let j = i + 1; j < boxes.length; j++) {
        const a = boxes[i]!;
        const b = boxes[j]!;
        const overlap = a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom;
        expect(overlap, `labels ${i} and ${j} overlap: ${JSON.stringify([a, b])}`).toBe(false);
      }
    }
    const frame = (await chart.boundingBox())!;
    for (const b of boxes) expect(b.left >= frame.x - 1 && b.right <= frame.x + frame.width + 1, 'labels stay inside the chart').toBe(true);
    await shoot('machine-densest-spectrum');
  });

  it("shows each trend with its unit, zone bands and levels", async () => {
    const trend = page.locator('figure[data-chart="trend"][data-indicator="velocity_rms_mm_per_s"]');
    await trend.waitFor({ timeout: 30_000 });
    expect(await trend.locator('.chart-title').textContent()).toMatch(/velocity RMS\s+mm\/s/);
    expect(Number(await trend.getAttribute('data-buckets'))).toBeGreaterThan(4);
    expect(Number(await trend.getAttribute('data-zone-bands'))).toBeGreaterThan(0);
    expect(await trend.getAttribute('data-alarm-level')).not.toBe('');
    expect(await inkedPixels(page, 'figure[data-chart="trend"][data-indicator="velocity_rms_mm_per_s"]')).toBeGreaterThan(200);
  });

  it('says on the upload card what it assumed: the unit of a file that states none, and where the speed came from', async () => {
    await page.goto(`${service.url}#/upload`);
    await page.reload();
    await page.locator('#up-point option').first().waitFor({ state: 'attached' });
    const sampleRateHz = 25600;
    // a tone of its own each run, so a kept test database (KINESPEC_CONSOLE_TEST_DATA_DIR) never answers with an earlier upload
    const wav = floatWav(sines([[24.5, 0.5], [441, 0.1], [1000 + (Date.now() % 997), 0.01]], sampleRateHz, 65536), sampleRateHz);
    await page.locator('#up-recorded-at').fill('2024-01-15T08:30:00');
    await page.locator('#up-files').setInputFiles({ name: 'no-unit.wav', mimeType: 'audio/wav', buffer: wav });
    const item = page.locator('.upload-item[data-file="no-unit.wav"]');
    await expect.poll(() => item.getAttribute('data-state'), { timeout: 60_000 }).toBe('done');
    const warnings = await item.locator('.upload-warnings li').allTextContents();
    expect(warnings.some((w) => /'unknown'.*point's unit/.test(w)), warnings.join(' | ')).toBe(true);
    expect(await item.locator('.upload-speed').textContent()).not.toMatch(/\(given\)/);
    const recordingId = (await item.getAttribute('data-recording-id'))!;
    const meta = await service.get<{ recordedAt: string }>(`/api/v1/recordings/${recordingId}`);
    expect(meta.recordedAt).toBe('2024-01-15T08:30:00.000Z');
    await shoot('upload-card-warnings');
  });

  it('moves a recording to another time and deletes it, and the audit log shows both', async () => {
    const item = page.locator('.upload-item[data-file="no-unit.wav"]');
    const recordingId = (await item.getAttribute('data-recording-id'))!;
    await item.getByRole('link', { name: 'open the analysis' }).click();
    await expect.poll(() => page.locator('.analysis').getAttribute('data-recording-id')).toBe(recordingId);
    await page.locator('#correction summary').click();
    await page.locator('#correction select[id^="move-point"] option').first().waitFor({ state: 'attached' });
    await page.getByLabel('Recorded at (UTC)').fill('2024-01-16T09:00:00');
    await page.getByLabel('Reason (kept in the log)').fill('logger clock a day behind');
    await page.locator('#move-recording').click();
    await expect.poll(() => page.locator('#correction-done').getAttribute('data-action'), { timeout: 30_000 }).toBe('move');
    const moved = await service.get<{ recordedAt: string }>(`/api/v1/recordings/${recordingId}`);
    expect(moved.recordedAt).toBe('2024-01-16T09:00:00.000Z');
    const audit = page.locator(`#audit-panel tr[data-recording-id="${recordingId}"]`);
    await expect.poll(() => audit.count(), { timeout: 30_000 }).toBe(1);
    expect(await audit.first().textContent()).toMatch(/moved.*logger clock a day behind/);

    // open it again (the page reloaded its point) and delete it
    await page.locator('.recording-select').selectOption(recordingId);
    await expect.poll(() => page.locator('.analysis').getAttribute('data-recording-id')).toBe(recordingId);
    await page.locator('#correction summary').click();
    await page.getByLabel('Reason (kept in the log)').fill('test file, not a reading');
    await page.getByLabel(/I want to delete this recording/).check();
    await page.locator('#delete-recording').click();
    await expect.poll(() => page.locator('#correction-done').getAttribute('data-action'), { timeout: 30_000 }).toBe('delete');
    await expect.poll(() => audit.count(), { timeout: 30_000 }).toBe(2);
    expect(await page.locator(`#audit-panel tr[data-recording-id="${recordingId}"][data-action="delete"]`).textContent()).toMatch(/deleted.*test file, not a reading/);
    const gone = await fetch(new URL(`api/v1/recordings/${recordingId}`, service.url), { headers: { authorization: `Bearer ${service.key}` } });
    expect(gone.status).toBe(404);
    await page.locator('#audit-panel').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(shots, 'machine-audit-log.png') });
  });

  it("serves the API documentation under Kinespec's name and mark", async () => {
    await page.goto(`${service.url}docs`);
    await page.locator('.swagger-ui .info').waitFor({ timeout: 30_000 });
    expect(await page.title()).toBe('Kinespec API documentation');
    expect(await page.locator('link[rel="icon"]').first().getAttribute('href')).toMatch(/favicon\.svg$/);
    await shoot('api-docs');
    await page.goto(service.url);
  });

  it('asked for nothing the service could not give (no missing favicon or asset)', () => {
    expect(failedRequests).toEqual([]);
  });

  it("shows each machine's soonest foreseen crossing in the fleet and sorts by it, soonest first", async () => {
    const machines = await service.get<Array<{ id: string; soonestCrossing: { level: string; remainingS: number } | null }>>('/api/v1/machines');
    expect(machines.some((m) => m.soonestCrossing !== null), 'the demo foresees at least one crossing').toBe(true);
    await page.goto(`${service.url}#/fleet`);
    await page.locator('#fleet-table tbody tr[data-machine-id]').first().waitFor();
    for (const m of machines) {
      const cell = page.locator(`tr[data-machine-id="${m.id}"] [data-crossing]`);
      expect(await cell.getAttribute('data-crossing')).toBe(m.soonestCrossing?.level ?? '');
      if (m.soonestCrossing) expect(await cell.textContent()).toMatch(new RegExp(`^${m.soonestCrossing.level} in about \\d+ (minute|hour|day|week|month)s?`));
      else expect(await cell.textContent()).toBe('none foreseen');
    }
    await page.locator('button[data-sort="crossing"]').click();
    expect(await page.locator('th:has(button[data-sort="crossing"])').getAttribute('aria-sort')).toBe('ascending');
    const order = await page.locator('#fleet-table tbody tr[data-machine-id]').evaluateAll((trs) =>
      trs.map((tr) => Number(tr.querySelector('[data-remaining-s]')?.getAttribute('data-remaining-s') ?? Infinity)));
    expect(order).toEqual([...order].sort((a, b) => a - b));
    await page.screenshot({ path: join(shots, 'fleet-forecast.png'), fullPage: true });
    await page.locator('button[data-sort="concern"]').click();
  });

  it('draws the trend forecast with its band, the onset and the zone boundaries with their values; the speed axis does not start at 0', async () => {
    const machines = await service.get<Array<{ id: string; soonestCrossing: { pointId: string } | null }>>('/api/v1/machines');
    const m = machines.find((x) => x.soonestCrossing)!;
    const pointId = m.soonestCrossing!.pointId;
    const trend = await service.get<{ zoneBoundaries: { ab: number; bc: number; cd: number }; forecast: { onsetAt: string | null; forecasts: Array<{ level: string; status: string; remainingS: number | null; crossingAt: string | null }> } }>(
      `/api/v1/trends?machine=${m.id}&point=${pointId}&indicator=velocity_rms_mm_per_s&bucket=week`);
    const soonest = trend.forecast.forecasts.filter((f) => f.status === 'crossing').sort((a, b) => a.remainingS! - b.remainingS!)[0]!;
    await page.goto(`${service.url}#/machine/${encodeURIComponent(m.id)}?point=${encodeURIComponent(pointId)}`);
    const chart = page.locator('figure[data-chart="trend"][data-indicator="velocity_rms_mm_per_s"]');
    await chart.waitFor({ timeout: 60_000 });
    expect(await chart.getAttribute('data-forecast-level')).toBe(soonest.level);
    expect(await chart.getAttribute('data-forecast-crossing-at')).toBe(soonest.crossingAt);
    expect(await chart.getAttribute('data-onset-at')).toBe(trend.forecast.onsetAt ?? '');
    const labels = JSON.parse((await chart.getAttribute('data-zone-labels'))!) as string[];
    expect(labels.map((l) => Number(l.split(' ')[1]))).toEqual([trend.zoneBoundaries.ab, trend.zoneBoundaries.bc, trend.zoneBoundaries.cd]);
    expect(await inkedPixels(page, 'figure[data-chart="trend"][data-indicator="velocity_rms_mm_per_s"]')).toBeGreaterThan(200);
    await chart.screenshot({ path: join(shots, 'trend-forecast-chart.png') });
    // the running speed: its axis spans its own range (the demo speeds vary by under 1 %)
    const speed = page.locator('figure[data-chart="trend"][data-indicator="speed_rpm"]');
    if ((await speed.count()) > 0) expect(Number(await speed.getAttribute('data-y-min'))).toBeGreaterThan(0);
    else expect(await page.locator('figure[data-chart="trend"]').count()).toBeGreaterThan(0);
  });

  it('lists tach and encoder points without velocity alarm or trip levels', async () => {
    const machines = await service.get<Array<{ id: string }>>('/api/v1/machines');
    let checked = 0;
    for (const m of machines) {
      const detail = await service.get<{ points: Array<{ id: string; quantity: string }> }>(`/api/v1/machines/${m.id}`);
      const pulse = detail.points.filter((p) => p.quantity === 'tach' || p.quantity === 'encoder');
      if (pulse.length === 0) continue;
      await page.goto(`${service.url}#/machine/${encodeURIComponent(m.id)}`);
      await page.locator('.point-option').first().waitFor();
      for (const p of pulse) expect(await page.locator(`.point-option[data-point-id="${p.id}"] .levels`).count(), p.id).toBe(0);
      const vibration = detail.points.find((p) => p.quantity !== 'tach' && p.quantity !== 'encoder')!;
      expect(await page.locator(`.point-option[data-point-id="${vibration.id}"] .levels`).textContent()).toMatch(/alarm \d/);
      checked += pulse.length;
    }
    expect(checked, 'the site has tach or encoder points').toBeGreaterThan(0);
  });

  it('shows in the alarm table the value now beside the value that raised the alarm', async () => {
    const alarms = await service.get<Array<{ id: string; machineId: string; value: number; currentValue: number | null }>>('/api/v1/alarms?state=active');
    const a = alarms.find((x) => x.currentValue !== null)!;
    expect(a, 'the demo raises alarms').toBeDefined();
    await page.goto(`${service.url}#/machine/${encodeURIComponent(a.machineId)}`);
    const row = page.locator(`tr[data-alarm-id="${a.id}"]`);
    await row.waitFor({ timeout: 60_000 });
    expect(Number(await row.locator('[data-raised-value]').getAttribute('data-raised-value'))).toBe(a.value);
    expect(Number(await row.locator('[data-current-value]').getAttribute('data-current-value'))).toBe(a.currentValue);
    expect(await page.locator('#alarm-panel th').allTextContents()).toContain('Value now');
  });

  it('raised no script errors', () => {
    expect(pageErrors).toEqual([]);
  });
});

describe.skipIf(hasChromium)('web console in Chromium (skipped)', () => {
  it.skip(`needs Debian's Chromium at ${chromiumPath}: apt-get install -y chromium`, () => {});
});
