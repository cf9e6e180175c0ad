// The gradebook's statistics (server/assignments/stats.ts) against mathjs, over random score lists.
import fc from 'fast-check'
import { mean as mathMean, median as mathMedian } from 'mathjs'
import { describe, expect, it } from 'vitest'
import { histogram, mean, median } from '../../server/assignments/stats'

const scores = fc.array(fc.double({ min: 0, max: 100, noNaN: true }), { minLength: 1, maxLength: 60 })

describe('score statistics', () => {
  it('agree with mathjs on mean and median (mathjs: a reference library the project did not write)', () => {
    fc.assert(
      fc.property(scores, (values) => {
        expect(mean(values)).toBeCloseTo(Number(mathMean(values)), 9)
        expect(median(values)).toBeCloseTo(Number(mathMedian(values)), 9)
      }),
    )
  })

  it('takes the mean of the two middle values for an even count', () => {
    expect(median([10, 40, 20, 30])).toBe(25)
  })

  it('has no mean or median for no scores', () => {
    expect(mean([])).toBeNull()
    expect(median([])).toBeNull()
  })

  it('puts every score in exactly one of ten bins, 100 in the last', () => {
    fc.assert(
      fc.property(scores, (values) => {
        const bins = histogram(values)
        expect(bins).toHaveLength(10)
        expect(bins.reduce((n, b) => n + b.count, 0)).toBe(values.length)
      }),
    )
    expect(
      histogram([100, 90, 89.9])
        .map((b) => b.count)
        .slice(8),
    ).toEqual([1, 2])
  })
})
