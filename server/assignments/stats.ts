// Descriptive statistics for a list of scores (0–100): mean, median and fixed-width histogram bins.

export { mean, median } from '@shared/insight/average'

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
