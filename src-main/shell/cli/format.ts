/** Plain-text tables for the terminal: columns padded, numbers right-aligned. */
export function table(headers: string[], rows: (string | number)[][]): string {
  const cells = [headers, ...rows.map((r) => r.map((c) => (typeof c === 'number' ? formatNumber(c) : c)))];
  const widths = headers.map((_, j) => Math.max(...cells.map((r) => (r[j] ?? '').length)));
  const numeric = headers.map((_, j) => rows.length > 0 && rows.every((r) => typeof r[j] === 'number'));
  const line = (r: string[]) =>
    r.map((c, j) => (numeric[j] ? c.padStart(widths[j]!) : c.padEnd(widths[j]!))).join('  ').trimEnd();
  return [line(cells[0]!), widths.map((w) => '-'.repeat(w)).join('  ').trimEnd(), ...cells.slice(1).map(line)].join('\n');
}

export function formatNumber(x: number): string {
  if (!Number.isFinite(x)) return Number.isNaN(x) ? '–' : String(x);
  if (Number.isInteger(x)) return x.toLocaleString('en-GB');
  const abs = Math.abs(x);
  return abs >= 100 ? x.toFixed(1) : abs >= 1 ? x.toFixed(3) : x.toPrecision(3);
}

export function formatDate(ms: number | null | undefined): string {
  return ms === null || ms === undefined || Number.isNaN(ms) ? '–' : new Date(ms).toISOString().slice(0, 10);
}
