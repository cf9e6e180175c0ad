// Dates are printed in the time zone the record names, never the server's; values in the catalogue's words.
import { describe, expect, it } from 'vitest'
import { formatDate, formatDateTime } from '../../../server/records'
import { formatDuration, formatSettingValue } from '../../../server/records/format'

describe('record dates', () => {
  // Offsets from the IANA tz database: London GMT until 29 March 2026, India UTC+5:30 all year,
  // Auckland UTC+13 (daylight time) until 5 April 2026.
  it.each([
    ['Europe/London', '12 Mar 2026, 09:48 GMT'],
    ['Asia/Kolkata', '12 Mar 2026, 15:18 GMT+5:30'],
    ['Pacific/Auckland', '12 Mar 2026, 22:48 GMT+13'],
  ])('prints an instant in %s', (timeZone, expected) => {
    expect(formatDateTime('2026-03-12T09:48:00Z', { timeZone, locale: 'en-GB' })).toBe(expected)
  })

  it('puts a late-evening UTC instant on the next day where the centre already is', () => {
    expect(formatDate('2026-03-10T23:30:00Z', { timeZone: 'Europe/London', locale: 'en-GB' })).toBe(
      '10 Mar 2026',
    )
    expect(formatDate('2026-03-10T23:30:00Z', { timeZone: 'Pacific/Auckland', locale: 'en-GB' })).toBe(
      '11 Mar 2026',
    )
  })
})

describe('record values', () => {
  it('prints settings in the catalogue’s words and units', () => {
    expect(formatSettingValue('ramp.accelSeconds', 10)).toBe('10 s')
    expect(formatSettingValue('reference.remoteSource', 'raiseLower')).toBe('Raise / lower inputs')
    expect(formatSettingValue('direction.reverseAllowed', false)).toBe('No')
    expect(formatSettingValue('motor.poles', 4)).toBe('4 poles')
  })

  it('prints durations in words', () => {
    expect(formatDuration(87_200)).toBe('1 min 27 s')
    expect(formatDuration(3_900_000)).toBe('1 h 05 min')
    expect(formatDuration(4_000)).toBe('4 s')
  })
})
