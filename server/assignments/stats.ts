// Descriptive statistics for a list of scores (0–100): mean, median and fixed-width histogram bins.

export function mean(values: number[]): number | null {
  return values.length ? values.reduce((sum, v) => sum + v, 0) / values.length : null
}

/** The middle value; for an even count, the mean of the two middle values. */
export function median(values: number[]): number | null {
  if (!values.length) return null
  const sorted = [...values].sort((a, b) => a - b)
  const mid = Math.floor(sorted.length / 2)
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
}

/** Bins [0,10), [10,20) … [90,100]; the last bin includes 100. */
export function histogram(values: number[], binWidth = 10): { from: number; to: number; count: number }[] {
  const bins = Array.from({ length: Math.ceil(100 / binWidth) }, (_, i) => ({
    from: i * binWidth,
    to: Math.min(100, (i + 1) * binWidth),
    count: 0,
  }))
  for (const value of values) {
    const index = Math.min(bins.length - 1, Math.max(0, Math.floor(value / binWidth)))
    bins[index]!.count++
  }
  return bins
}
