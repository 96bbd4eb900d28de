// Times in forms are UTC, said so in their labels: a recording's time is the logger's, not the browser's zone.

/** '2025-03-14T08:00:05' for a datetime-local input, in UTC. */
export function utcInputValue(iso: string | Date): string {
  const d = typeof iso === 'string' ? new Date(iso) : iso;
  if (Number.isNaN(d.getTime())) return '';
  return d.toISOString().slice(0, 19);
}

/** The ISO time of a datetime-local value read as UTC ('2025-03-14T08:00' → '2025-03-14T08:00:00.000Z'), or null. */
export function utcFromInput(value: string): string | null {
  if (!/^\d{4}-\d\d-\d\dT\d\d:\d\d(:\d\d(\.\d+)?)?$/.test(value)) return null;
  const d = new Date(`${value}Z`);
  return Number.isNaN(d.getTime()) ? null : d.toISOString();
}
