// Copying a cohort moves dates by whole calendar days. The expected day counts were computed with Python's
// datetime.date subtraction (a reference implementation we did not write), not with this code.
import { describe, expect, it } from 'vitest'
import { firstOpening, shiftDaysTo, shifted, toDateInput } from '@/components/cohorts/copyDates'

describe('copying dates', () => {
  it('finds the earliest opening, or none', () => {
    expect(firstOpening([])).toBeNull()
    expect(
      firstOpening([
        { opensAt: '2027-03-02T08:00:00.000Z' },
        { opensAt: '2027-01-15T08:00:00.000Z' },
      ])!.toISOString(),
    ).toBe('2027-01-15T08:00:00.000Z')
  })

  it('counts whole calendar days across a month end, a leap day and clock changes', () => {
    const from = new Date(2027, 0, 31, 9, 30)
    const expected: [string, number][] = [
      ['2027-02-01', 1],
      ['2027-03-28', 56],
      ['2027-11-01', 274],
      ['2028-02-29', 394],
      ['2026-12-31', -31],
      ['2027-01-31', 0],
    ]
    for (const [to, days] of expected) expect(shiftDaysTo(from, to)).toBe(days)
    expect(shiftDaysTo(from, 'not a date')).toBe(0)
  })

  it('moves an instant by whole days of 24 hours and writes input dates on the local calendar', () => {
    expect(shifted('2027-01-15T08:00:00.000Z', 182)).toBe('2027-07-16T08:00:00.000Z')
    expect(shifted('2027-01-15T08:00:00.000Z', -1)).toBe('2027-01-14T08:00:00.000Z')
    const local = new Date(2027, 1, 3, 23, 59)
    expect(toDateInput(local)).toBe('2027-02-03')
    expect(toDateInput(new Date(2027, 1, 3 + 30, 12))).toBe('2027-03-05')
  })
})
