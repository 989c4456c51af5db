/** Plain fixed-width text tables for terminal reports. */

/** Rows padded to column widths, with a header and a rule; each line indented by two spaces. */
export function table(header: string[], rows: string[][]): string[] {
  const widths = header.map((h, j) => Math.max(h.length, ...rows.map((r) => (r[j] ?? '').length)));
  const line = (cells: string[]): string => `  ${cells.map((c, j) => (c ?? '').padEnd(widths[j])).join('  ')}`.trimEnd();
  return [line(header), `  ${widths.map((w) => '-'.repeat(w)).join('  ')}`, ...rows.map(line)];
}
