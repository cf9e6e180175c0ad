// Which copy of an attempt to continue: the rule for two computers, stated as cases.
import { describe, expect, it } from 'vitest'
import type { AttemptEvent } from '@shared/model/events'
import { chooseStart, type AttemptCopy } from '@/simulator/machines/attemptStart'

const e = (t: number): AttemptEvent => ({ t, type: t % 2 ? 'lock.applied' : 'lock.removed' })
const copy = (source: AttemptCopy['source'], attemptId: string, times: number[]): AttemptCopy => ({
  source,
  attemptId,
  events: times.map(e),
  savedAt: '2026-12-01T10:00:00.000Z',
})

describe('where an attempt continues', () => {
  it('starts fresh with nothing saved anywhere', () => {
    expect(chooseStart(null, null)).toEqual({ kind: 'fresh' })
  })

  it('takes the longer copy without asking when one extends the other', () => {
    const b = copy('browser', 'a', [2, 4, 6])
    const s = copy('server', 'a', [2, 4])
    expect(chooseStart(b, s)).toMatchObject({ kind: 'resume', copy: b })
    expect(chooseStart(copy('browser', 'a', [2]), s)).toMatchObject({ kind: 'resume', copy: s })
  })

  it('asks when the copies went separate ways, offering the server’s or this one as a new attempt', () => {
    const d = chooseStart(copy('browser', 'a', [2, 3]), copy('server', 'a', [2, 4]))
    expect(d.kind).toBe('ask')
    if (d.kind !== 'ask') return
    expect(d.choices.map((c) => [c.copy?.source, c.asNewAttempt])).toEqual([
      ['server', false],
      ['browser', true],
    ])
  })

  it('asks about two different attempts, and offers a new one too', () => {
    const d = chooseStart(copy('browser', 'a', [2]), copy('server', 'b', [2, 4]))
    expect(d.kind === 'ask' && d.choices.map((c) => c.copy?.attemptId ?? 'new')).toEqual(['a', 'b', 'new'])
  })

  it('resumes the server’s copy without asking when a Resume link named it', () => {
    const s = copy('server', 's', [2, 4])
    expect(chooseStart(null, s, 's')).toMatchObject({ kind: 'resume', copy: s })
    expect(chooseStart(null, s, 'other').kind).toBe('ask')
  })

  it('says how many actions each copy holds and where it was saved', () => {
    const d = chooseStart(null, copy('server', 's', [2, 4, 6]))
    expect(d.kind === 'ask' && d.choices[0].detail).toMatch(/^3 actions, saved on the server /)
  })
})
