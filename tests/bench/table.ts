// One row of the benchmark table that `npm run bench` prints.
export interface BenchRow {
  group: string
  name: string
  value: number
  unit: string
  /** What the figure is compared with in the same run, if anything. */
  baseline?: { name: string; value: number }
  /** Human-readable target, and whether this run met it. */
  target?: string
  met?: boolean
}

function formatNumber(value: number): string {
  if (!Number.isFinite(value)) return String(value)
  if (Math.abs(value) >= 1000) return value.toFixed(0)
  if (Math.abs(value) >= 10) return value.toFixed(1)
  return value.toFixed(3)
}

export function formatTable(rows: BenchRow[]): string {
  const header = ['group', 'figure', 'value', 'baseline (same run)', 'ratio', 'target', 'met']
  const body = rows.map((row) => [
    row.group,
    row.name,
    `${formatNumber(row.value)} ${row.unit}`,
    row.baseline ? `${row.baseline.name}: ${formatNumber(row.baseline.value)}` : '',
    row.baseline && row.baseline.value !== 0 ? `${(row.value / row.baseline.value).toFixed(2)}×` : '',
    row.target ?? '',
    row.met === undefined ? '' : row.met ? 'yes' : 'NO',
  ])
  const widths = header.map((h, i) => Math.max(h.length, ...body.map((r) => r[i]!.length)))
  const line = (cells: string[]) => '| ' + cells.map((c, i) => c.padEnd(widths[i]!)).join(' | ') + ' |'
  return [line(header), line(widths.map((w) => '-'.repeat(w))), ...body.map(line)].join('\n')
}
