import { ApiProblem } from '../api-client.js';
import type { IndicatorRow, Trend } from '../api-types.js';
import type { AppContext, Cleanup } from '../app-context.js';
import { createTrendChart, type TrendChart } from '../charts/trend-chart.js';
import { clear, h, message, uid } from '../dom.js';
import { indicatorName } from '../format.js';

// Every indicator of a point over time: overall levels first, hypothesis scores in a fold below.

const preferredOrder = ['velocity_rms_mm_per_s', 'acceleration_peak', 'envelope_rms', 'crest_factor', 'kurtosis'];

export function renderTrendPanel(host: HTMLElement, ctx: AppContext, machineId: string, pointId: string): Cleanup {
  const charts: TrendChart[] = [];
  const bucketId = uid('trend-bucket');
  const bucket = h(
    'select',
    { id: bucketId },
    h('option', { value: 'day' }, 'day'),
    h('option', { value: 'week', selected: true }, 'week (ISO)'),
    h('option', { value: 'month' }, 'month'),
  );
  const grid = h('div', { class: 'trend-grid', id: 'trend-grid' });
  const scoresBox = h('details', { class: 'score-trends' }, h('summary', {}, 'Hypothesis score trends'));
  const scoresGrid = h('div', { class: 'trend-grid' });
  scoresBox.append(scoresGrid);
  const section = h(
    'section',
    { class: 'panel trends', 'aria-labelledby': 'trends-title' },
    h('div', { class: 'panel-head' }, h('h2', { id: 'trends-title' }, `Trends · ${pointId}`), h('span', { class: 'field' }, h('label', { for: bucketId }, 'Bucket'), bucket)),
    grid,
    scoresBox,
  );
  host.append(section);
  let indicators: IndicatorRow[] = [];
  let scoresDrawn = false;
  let generation = 0;

  const draw = async (target: HTMLElement, rows: IndicatorRow[], gen: number) => {
    const trends = await Promise.all(
      rows.map((r) =>
        ctx.api
          .get<Trend>('/api/v1/trends', { machine: machineId, point: pointId, indicator: r.indicator, bucket: bucket.value })
          .catch((err: unknown) => (err instanceof ApiProblem ? err : new ApiProblem({ type: 'about:blank', title: String(err), status: 0 }))),
      ),
    );
    if (gen !== generation) return;
    trends.forEach((t, i) => {
      const cell = h('div', { class: 'trend-cell' });
      target.append(cell);
      if (t instanceof ApiProblem) cell.append(message('error', `${indicatorName(rows[i]!.indicator)}: ${t.message}`));
      else charts.push(createTrendChart(cell, t));
    });
  };

  const destroyCharts = () => {
    for (const c of charts.splice(0)) c.destroy();
    clear(grid);
    clear(scoresGrid);
  };

  const load = async () => {
    generation += 1;
    const gen = generation;
    destroyCharts();
    scoresDrawn = false;
    try {
      indicators = await ctx.api.get<IndicatorRow[]>('/api/v1/indicators', { machine: machineId, point: pointId });
    } catch (err) {
      grid.append(message('error', err instanceof ApiProblem ? err.message : String(err)));
      return;
    }
    if (gen !== generation) return;
    const overall = indicators
      .filter((r) => !r.indicator.startsWith('score:'))
      .sort((a, b) => {
        const ia = preferredOrder.indexOf(a.indicator);
        const ib = preferredOrder.indexOf(b.indicator);
        return (ia < 0 ? 99 : ia) - (ib < 0 ? 99 : ib) || a.indicator.localeCompare(b.indicator);
      });
    if (overall.length === 0) grid.append(message('empty', 'No trend values for this point yet.'));
    await draw(grid, overall, gen);
    if (scoresBox.open) await drawScores(gen);
  };
  const drawScores = async (gen: number) => {
    if (scoresDrawn) return;
    scoresDrawn = true;
    const scores = indicators.filter((r) => r.indicator.startsWith('score:'));
    if (scores.length === 0) scoresGrid.append(message('empty', 'No hypothesis scores recorded.'));
    await draw(scoresGrid, scores, gen);
  };
  scoresBox.addEventListener('toggle', () => {
    if (scoresBox.open) void drawScores(generation);
  });
  bucket.addEventListener('change', () => void load());
  void load();
  return () => {
    generation += 1;
    destroyCharts();
  };
}
