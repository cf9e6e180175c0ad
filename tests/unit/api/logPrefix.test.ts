// Saves only append: the server's check that a new log begins with the stored one, on the JSON text the
// grading thread writes (no parse on the event loop) and event by event when the spellings differ.
import { describe, expect, it } from 'vitest'
import { isLogPrefix } from '../../../shared/api/attempts'
import { storedLogOpens } from '../../../server/attempts/log-prefix'

const lock = { t: 500, type: 'lock.removed' }
const on = { t: 900, type: 'power.on' }
const probes = { t: 700, type: 'meter.probes', red: 'drive.l1', black: 'drive.l2' }
const text = (events: object[]) => JSON.stringify(events)

describe('storedLogOpens', () => {
  it('accepts an empty stored log, the same log, and a longer one', () => {
    expect(storedLogOpens('[]', text([lock]))).toBe(true)
    expect(storedLogOpens(text([lock]), text([lock]))).toBe(true)
    expect(storedLogOpens(text([lock]), text([lock, on]))).toBe(true)
  })

  it('refuses a log that dropped or changed a stored event, or is shorter', () => {
    expect(storedLogOpens(text([lock, probes]), text([lock, on]))).toBe(false)
    expect(storedLogOpens(text([lock, on]), text([lock]))).toBe(false)
    expect(storedLogOpens(text([lock]), '[]')).toBe(false)
  })

  it('does not take a number that merely starts the same for the same event', () => {
    // `[{"t":1` opens `[{"t":10…` as text; the character after the stored event must end it.
    expect(storedLogOpens(text([{ t: 1, type: 'power.on' }]), text([{ t: 10, type: 'power.on' }]))).toBe(false)
  })

  it('compares event by event when the stored text is spelled otherwise', () => {
    expect(storedLogOpens('[ {"type": "lock.removed", "t": 500} ]', text([lock, on]))).toBe(true)
    expect(storedLogOpens('[{"type":"lock.removed","t":501}]', text([lock, on]))).toBe(false)
  })
})

describe('isLogPrefix', () => {
  it('compares flat events field by field, whatever the key order', () => {
    expect(isLogPrefix([{ type: 'lock.removed', t: 500 }], [lock, on])).toBe(true)
    expect(isLogPrefix([{ ...probes, black: null }], [probes])).toBe(false)
    expect(isLogPrefix([lock, on], [lock])).toBe(false)
  })
})
