// Normalises the Campbell data the signatures endpoint returns into what the chart draws:
// natural frequencies (one curve per mode over speed) and excitation order rays f = order · n / 60
// (n in rpm of the reference shaft), with their crossings — the speeds where an excitation order
// meets a natural frequency (common practice: Campbell diagram).

export interface CampbellView {
  speedsRpm: number[];
  modes: Array<{ label: string; frequenciesHz: number[] }>;
  excitations: Array<{ label: string; order: number; frequenciesHz: number[] }>;
  /** lines that do not follow the speed (electrical): horizontal, not natural frequencies */
  fixedLines: Array<{ label: string; frequencyHz: number }>;
  crossings: Array<{ label: string; speedRpm: number; frequencyHz: number; nearNominal?: boolean }>;
}

type Loose = Record<string, unknown>;
const isNumArray = (v: unknown): v is number[] => Array.isArray(v) && v.every((x) => typeof x === 'number');
const num = (v: unknown): number | null => (typeof v === 'number' && Number.isFinite(v) ? v : null);
const str = (v: unknown): string | null => (typeof v === 'string' && v ? v : null);

function speedGrid(minRpm: number, maxRpm: number, count = 41): number[] {
  return Array.from({ length: count }, (_, i) => minRpm + ((maxRpm - minRpm) * i) / (count - 1));
}

function readSpeeds(c: Loose): number[] | null {
  for (const name of ['speedsRpm', 'speedRpm', 'speeds', 'rpm']) if (isNumArray(c[name]) && (c[name] as number[]).length > 1) return c[name] as number[];
  const range = (c.speedRangeRpm ?? c.rangeRpm) as unknown;
  if (isNumArray(range) && range.length === 2) return speedGrid(range[0]!, range[1]!);
  if (range && typeof range === 'object') {
    const lo = num((range as Loose).minRpm);
    const hi = num((range as Loose).maxRpm);
    if (lo !== null && hi !== null && hi > lo) return speedGrid(lo, hi);
  }
  const min = num(c.minRpm);
  const max = num(c.maxRpm);
  return min !== null && max !== null && max > min ? speedGrid(min, max) : null;
}

function readModes(c: Loose, speeds: number[]): CampbellView['modes'] {
  const raw = c.modes ?? c.naturalFrequencies ?? c.naturalFrequenciesHz;
  if (!Array.isArray(raw)) return [];
  const flat = (f: number) => speeds.map(() => f);
  if (isNumArray(raw)) return raw.map((f, i) => ({ label: `mode ${i + 1} · ${f.toPrecision(4)} Hz`, frequenciesHz: flat(f) }));
  if (raw.every(isNumArray)) {
    const rows = raw as number[][];
    // [speed][mode] when the outer length matches the speeds, else [mode][speed]
    if (rows.length === speeds.length && rows[0]!.length !== speeds.length) {
      return rows[0]!.map((_, m) => ({ label: `mode ${m + 1}`, frequenciesHz: rows.map((r) => r[m]!) }));
    }
    return rows.map((r, m) => ({ label: `mode ${m + 1}`, frequenciesHz: r.length === speeds.length ? r : flat(r[0]!) }));
  }
  return (raw as Loose[]).flatMap((m, i) => {
    const series = m.frequenciesHz;
    const single = num(m.frequencyHz) ?? num(m.naturalFrequencyHz);
    const label = str(m.label) ?? str(m.id) ?? `mode ${i + 1}`;
    if (isNumArray(series) && series.length === speeds.length) return [{ label, frequenciesHz: series }];
    return single !== null ? [{ label: `${label} · ${single.toPrecision(4)} Hz`, frequenciesHz: flat(single) }] : [];
  });
}

function readExcitations(c: Loose, speeds: number[]): CampbellView['excitations'] {
  const raw = c.excitations ?? c.orders ?? c.lines;
  if (!Array.isArray(raw)) return [];
  const ray = (order: number) => speeds.map((n) => (order * n) / 60);
  if (isNumArray(raw)) return raw.map((order) => ({ label: `${order}×`, order, frequenciesHz: ray(order) }));
  return (raw as Loose[]).flatMap((e) => {
    const order = num(e.order);
    if (order === null) return [];
    const series = e.frequenciesHz;
    return [{ label: str(e.label) ?? `${order}×`, order, frequenciesHz: isNumArray(series) && series.length === speeds.length ? series : ray(order) }];
  });
}

/** Where a ray crosses a mode, by linear interpolation between grid speeds. */
export function findCrossings(view: Pick<CampbellView, 'speedsRpm' | 'modes' | 'excitations'>): CampbellView['crossings'] {
  const out: CampbellView['crossings'] = [];
  const s = view.speedsRpm;
  for (const e of view.excitations) {
    for (const m of view.modes) {
      for (let i = 1; i < s.length; i++) {
        const d0 = e.frequenciesHz[i - 1]! - m.frequenciesHz[i - 1]!;
        const d1 = e.frequenciesHz[i]! - m.frequenciesHz[i]!;
        if (d0 === 0 || d0 * d1 < 0 || (d1 === 0 && i === s.length - 1)) {
          const t = d0 === 0 ? 0 : d0 / (d0 - d1);
          out.push({
            label: `${e.label} × ${m.label.split(' · ')[0]}`,
            speedRpm: s[i - 1]! + t * (s[i]! - s[i - 1]!),
            frequencyHz: m.frequenciesHz[i - 1]! + t * (m.frequenciesHz[i]! - m.frequenciesHz[i - 1]!),
          });
        }
      }
    }
  }
  return out;
}

/**
 * @param campbell the endpoint's `campbell` field, whatever its exact shape
 * @param fallback used when `campbell` is missing: the response's natural frequencies, the lines'
 *   orders and the model's speed range
 */
export function campbellView(
  campbell: unknown,
  fallback: { naturalFrequenciesHz?: number[]; orders?: Array<{ order: number; label: string }>; minRpm?: number; maxRpm?: number },
): CampbellView | null {
  const c: Loose = campbell && typeof campbell === 'object' ? (campbell as Loose) : {};
  const minRpm = fallback.minRpm;
  const maxRpm = fallback.maxRpm;
  const speeds = readSpeeds(c) ?? (minRpm !== undefined && maxRpm !== undefined && maxRpm > minRpm ? speedGrid(minRpm, maxRpm) : null);
  if (!speeds) return null;
  let modes = readModes(c, speeds);
  if (modes.length === 0 && fallback.naturalFrequenciesHz) modes = readModes({ modes: fallback.naturalFrequenciesHz }, speeds);
  let excitations = readExcitations(c, speeds);
  if (excitations.length === 0 && fallback.orders) excitations = readExcitations({ excitations: fallback.orders }, speeds);
  if (modes.length === 0 && excitations.length === 0) return null;
  const fixedLines = Array.isArray(c.fixedLines)
    ? (c.fixedLines as Loose[]).flatMap((f) => {
        const frequencyHz = num(f.frequencyHz);
        return frequencyHz !== null ? [{ label: str(f.label) ?? `${frequencyHz} Hz`, frequencyHz }] : [];
      })
    : [];
  const given = Array.isArray(c.crossings)
    ? (c.crossings as Loose[]).flatMap((x) => {
        const speedRpm = num(x.speedRpm);
        const frequencyHz = num(x.frequencyHz) ?? num(x.naturalFrequencyHz);
        const label = str(x.label) ?? [str(x.orderLabel), str(x.naturalFrequencyLabel)].filter(Boolean).join(' × ');
        return speedRpm !== null && frequencyHz !== null ? [{ label, speedRpm, frequencyHz, ...(typeof x.nearNominal === 'boolean' ? { nearNominal: x.nearNominal } : {}) }] : [];
      })
    : null;
  const view = { speedsRpm: speeds, modes, excitations, fixedLines };
  return { ...view, crossings: given ?? findCrossings(view) };
}
