/** Rows padded to their columns' widths, two spaces apart; the columns in `rightAligned` are padded on the left. */
export function alignColumns(rows: readonly (readonly string[])[], rightAligned: ReadonlySet<number>): string[] {
  const widths = rows[0]!.map((_, c) => Math.max(...rows.map((r) => r[c]!.length)));
  return rows.map((r) => r.map((cell, c) => (rightAligned.has(c) ? cell.padStart(widths[c]!) : cell.padEnd(widths[c]!))).join('  ').trimEnd());
}
