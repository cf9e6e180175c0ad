// Locks and tags on the disconnect: the apprentice's own lock carries a tag with their name and the date;
// a supervisor's lock from the story can be removed only by the supervisor (OSHA 1910.147(e)(3): each
// lockout device is removed by the employee who applied it, cited from memory), and the supply stays off
// while any lock is on (OSHA 1910.147(d)(4); common practice).
import { describe, expect, it } from 'vitest'
import { attemptEventSchema, createSimulation, ModelInputError, readDrive } from '../../../shared/model/index'
import type { SimulationSetup } from '../../../shared/model/index'
import { raiseLowerSetup, run, start } from './fixtures'

const supervised = (): SimulationSetup =>
  raiseLowerSetup({ power: { on: false, locked: false, supervisorLock: { name: 'Rena Dubrovny' } } })
const tag = { name: 'Sam Apprentice', date: '2026-12-03' }

describe('the apprentice’s own lock and tag', () => {
  it('keeps what the tag says while the lock is on and forgets it when the lock comes off', () => {
    const off = start(raiseLowerSetup({ power: { on: false, locked: false } }))
    const locked = run(off, [{ t: 0, type: 'lock.applied', tag }])
    expect(locked.power).toEqual({ on: false, locked: true, tag })
    const unlocked = run(locked, [{ t: 1000, type: 'lock.removed' }])
    expect(unlocked.power).toEqual({ on: false, locked: false })
  })

  it('accepts a lock event without a tag, as logs written before tags have them', () => {
    expect(attemptEventSchema.safeParse({ t: 0, type: 'lock.applied' }).success).toBe(true)
    expect(attemptEventSchema.safeParse({ t: 0, type: 'lock.removed' }).success).toBe(true)
  })

  it('refuses a tag without a name or with a date that is not a calendar date', () => {
    const bad = [
      { t: 0, type: 'lock.applied', tag: { name: ' ', date: '2026-12-03' } },
      { t: 0, type: 'lock.applied', tag: { name: 'Sam', date: '3 December' } },
      { t: 0, type: 'lock.applied', tag: { name: 'Sam', date: '2026-13-40' } },
    ]
    for (const event of bad) expect(attemptEventSchema.safeParse(event).success).toBe(false)
  })
})

describe('a supervisor’s lock from the story', () => {
  it('keeps the supply off while it is on, saying whose lock it is', () => {
    const s = run(start(supervised()), [{ t: 0, type: 'power.on' }])
    expect(s.power.on).toBe(false)
    expect(s.messages[0].code).toBe('powerOnLocked')
    expect(s.messages[0].text).toContain('Rena Dubrovny')
  })

  it('cannot be removed by the apprentice: the model refuses in words and the lock stays', () => {
    for (const event of [
      { t: 0, type: 'lock.removed' as const, whose: 'supervisor' as const },
      { t: 0, type: 'lock.removed' as const },
    ]) {
      const s = run(start(supervised()), [event])
      expect(s.power.supervisorLock).toEqual({ name: 'Rena Dubrovny' })
      expect(s.messages[0].code).toBe('lockNotYours')
      expect(s.messages[0].text).toMatch(/Rena Dubrovny's\. Only the person who applied a lock may remove it/)
    }
  })

  it('takes the apprentice’s own lock beside it; removing theirs leaves the supervisor’s on', () => {
    const s = run(start(supervised()), [
      { t: 0, type: 'lock.applied', tag },
      { t: 1000, type: 'lock.removed' },
      { t: 2000, type: 'power.on' },
    ])
    expect(s.power).toEqual({ on: false, locked: false, supervisorLock: { name: 'Rena Dubrovny' } })
    expect(s.messages[0].code).toBe('powerOnLocked')
  })

  it('comes off when the supervisor is asked; the apprentice’s own lock still keeps the supply off', () => {
    const asked = run(start(supervised()), [
      { t: 0, type: 'lock.applied', tag },
      { t: 1000, type: 'supervisorLock.removed' },
      { t: 2000, type: 'power.on' },
    ])
    expect(asked.power.supervisorLock).toBeUndefined()
    expect(asked.power.on).toBe(false)
    const on = run(asked, [
      { t: 3000, type: 'lock.removed' },
      { t: 4000, type: 'power.on' },
    ])
    expect(readDrive(on).lineOn).toBe(true)
  })

  it('is refused on a disconnect that starts on', () => {
    const setup = raiseLowerSetup({ power: { on: true, locked: false, supervisorLock: { name: 'Rena' } } })
    expect(() => createSimulation(setup)).toThrow(ModelInputError)
  })
})
