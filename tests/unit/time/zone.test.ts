// Dates on the centre's clock. Offsets are those of the IANA time zone database (tzdata): Europe/London
// is UTC+0 in winter and UTC+1 from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last
// Sunday of October (the UK Summer-Time Order 2002, following EU Directive 2000/84/EC);
// America/Chicago is UTC−6 in winter, UTC−5 in summer (US Energy Policy Act of 2005: second Sunday of
// March, first Sunday of November, at 02:00 local).
import { describe, expect, it } from 'vitest'
import {
  formatInZone,
  isTimeZone,
  isoToWallTime,
  wallTimeToIso,
  zoneOffsetMinutes,
  zonedDate,
} from '@shared/time/zone'

describe('time zones', () => {
  it('knows IANA names and refuses others', () => {
    expect(isTimeZone('Europe/London')).toBe(true)
    expect(isTimeZone('UTC')).toBe(true)
    expect(isTimeZone('Mars/Olympus_Mons')).toBe(false)
    expect(isTimeZone('')).toBe(false)
  })

  it('reads the offsets of the tz database either side of the clock changes', () => {
    expect(zoneOffsetMinutes(Date.parse('2027-01-15T12:00:00Z'), 'Europe/London')).toBe(0)
    expect(zoneOffsetMinutes(Date.parse('2027-07-15T12:00:00Z'), 'Europe/London')).toBe(60)
    // 2027's last Sunday in March is the 28th: 00:59 UTC is still GMT, 01:00 UTC is BST.
    expect(zoneOffsetMinutes(Date.parse('2027-03-28T00:59:00Z'), 'Europe/London')).toBe(0)
    expect(zoneOffsetMinutes(Date.parse('2027-03-28T01:00:00Z'), 'Europe/London')).toBe(60)
    expect(zoneOffsetMinutes(Date.parse('2027-01-15T12:00:00Z'), 'America/Chicago')).toBe(-360)
    expect(zoneOffsetMinutes(Date.parse('2027-07-15T12:00:00Z'), 'America/Chicago')).toBe(-300)
  })

  it('turns a wall time on the centre’s clock into the instant, and back', () => {
    expect(wallTimeToIso('2027-07-01T17:00', 'Europe/London')).toBe('2027-07-01T16:00:00.000Z')
    expect(wallTimeToIso('2027-01-04T09:30', 'America/Chicago')).toBe('2027-01-04T15:30:00.000Z')
    expect(isoToWallTime('2027-07-01T16:00:00.000Z', 'Europe/London')).toBe('2027-07-01T17:00')
    expect(wallTimeToIso('not a time', 'UTC')).toBe('')
  })

  it('takes the first of a wall time that happens twice, and lands after the skipped hour', () => {
    // 31 October 2027: 01:30 happens at 00:30 UTC (BST) and again at 01:30 UTC (GMT).
    expect(wallTimeToIso('2027-10-31T01:30', 'Europe/London')).toBe('2027-10-31T00:30:00.000Z')
    // 28 March 2027: 01:30 never happens in London; 01:30 UTC is 02:30 BST.
    expect(wallTimeToIso('2027-03-28T01:30', 'Europe/London')).toBe('2027-03-28T01:30:00.000Z')
  })

  it('formats in the zone whatever the machine’s own zone, naming the zone where asked', () => {
    const iso = '2027-07-01T23:30:00.000Z'
    expect(formatInZone(iso, 'Europe/London', 'date')).toBe('2 Jul 2027')
    expect(formatInZone(iso, 'America/Chicago', 'date')).toBe('1 Jul 2027')
    expect(formatInZone(iso, 'Europe/London', 'dateTimeZone')).toMatch(/00:30 BST$/)
    expect(formatInZone(null, 'UTC')).toBe('—')
    expect(zonedDate(iso, 'Europe/London')).toBe('2027-07-02')
  })
})
