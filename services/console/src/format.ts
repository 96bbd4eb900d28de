// Number, time and name formatting shared by every page.

/** Three significant figures, no exponent between 0.001 and 1e6. */
export function formatNumber(value: number | null | undefined, digits = 3): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '–';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e6 || magnitude < 1e-3) return value.toExponential(digits - 1);
  return Number(value.toPrecision(digits)).toString();
}

export function formatFixed(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '–';
  return value.toFixed(decimals);
}

export function formatScore(score: number | null | undefined): string {
  return score === null || score === undefined || !Number.isFinite(score) ? '–' : score.toFixed(2);
}

/** "2024-05-03 14:20" in the browser's time zone. */
export function formatDateTime(iso: string | null | undefined): string {
  if (!iso) return '–';
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())} ${pad(date.getHours())}:${pad(date.getMinutes())}`;
}

/** "3 h ago", "5 d ago": how stale a measurement is, relative to `now`. */
export function formatAge(iso: string | null | undefined, now: Date = new Date()): string {
  if (!iso) return 'never';
  const then = new Date(iso).getTime();
  if (Number.isNaN(then)) return iso;
  const minutes = Math.round((now.getTime() - then) / 60_000);
  if (minutes < 1) return 'just now';
  if (minutes < 60) return `${minutes} min ago`;
  const hours = Math.round(minutes / 60);
  if (hours < 48) return `${hours} h ago`;
  const days = Math.round(hours / 24);
  if (days < 60) return `${days} d ago`;
  return `${Math.round(days / 30)} mo ago`;
}

/** A unit for display: the API writes dimensionless indicators as "1". */
export function displayUnit(unit: string | null | undefined): string {
  return !unit || unit === '1' ? '' : unit;
}

/** 'bearing-outer-race' → 'bearing outer race'. */
export function faultName(fault: string): string {
  return fault.replace(/[-_]+/g, ' ');
}

/** 'velocity_rms_mm_per_s' → 'velocity RMS'; 'score:gear-missing-tooth:pinion-1' → 'score gear missing tooth @ pinion-1'. */
export function indicatorName(indicator: string): string {
  if (indicator.startsWith('score:')) {
    const [, fault = '', component = ''] = indicator.split(':');
    return `score: ${faultName(fault)} @ ${component}`;
  }
  const known: Record<string, string> = {
    velocity_rms_mm_per_s: 'velocity RMS',
    acceleration_peak: 'acceleration peak',
    crest_factor: 'crest factor',
    kurtosis: 'kurtosis',
    envelope_rms: 'envelope RMS',
  };
  return known[indicator] ?? indicator.replace(/_/g, ' ').replace(/:/g, ' · ');
}
