// The form checks built on the shared schemas: the messages a user sees before anything is sent.
import { describe, expect, it } from 'vitest'
import { checkAssignmentForm, defaultAssignmentForm } from '@/components/assignments/assignmentForm'
import { checkExceptionForm, exceptionText } from '@/components/assignments/exceptionForm'
import { checkOverride } from '@/components/attempts/overrideForm'
import { toGradebookQuery } from '@/components/gradebook/gradebookQuery'
import { ids } from './helpers'

describe('the assign-a-scenario form', () => {
  const base = { ...defaultAssignmentForm(new Date('2026-12-01T09:00:00')), scenarioId: ids.scenario }

  it('accepts a scenario with a due date after the opening date', () => {
    const result = checkAssignmentForm({ ...base, opensAt: '2026-12-01T09:00', dueAt: '2026-12-08T17:00' })
    expect(result.ok).toBe(true)
    if (result.ok) {
      expect(result.body.attemptLimit).toBe(3)
      expect(Date.parse(result.body.dueAt)).toBeGreaterThan(Date.parse(result.body.opensAt))
    }
  })

  it('says the due date must come after the opening date', () => {
    const result = checkAssignmentForm({ ...base, opensAt: '2026-12-08T09:00', dueAt: '2026-12-01T17:00' })
    expect(result).toEqual({ ok: false, errors: { dueAt: 'The due date must be after the opening date' } })
  })

  it('asks for a scenario', () => {
    const result = checkAssignmentForm({ ...base, scenarioId: null })
    expect(result.ok).toBe(false)
    if (!result.ok) expect(result.errors.scenarioId).toBe('Choose a scenario')
  })

  it('sends no attempt limit when the limit is switched off', () => {
    const result = checkAssignmentForm({ ...base, limitAttempts: false, attemptLimit: '' })
    expect(result.ok && result.body.attemptLimit).toBeNull()
  })

  it('sets the standard assistance level unless the instructor chooses another, and sends the choice', () => {
    expect(base.assistanceLevel).toBe('standard')
    const result = checkAssignmentForm({ ...base, assistanceLevel: 'assessment' })
    expect(result.ok && result.body.assistanceLevel).toBe('assessment')
  })

  it('refuses a limit of zero attempts', () => {
    const result = checkAssignmentForm({ ...base, attemptLimit: 0 })
    expect(result.ok).toBe(false)
    if (!result.ok) expect(Object.keys(result.errors)).toEqual(['attemptLimit'])
  })
})

describe('the grade override form', () => {
  it('asks for a reason', () => {
    expect(checkOverride({ score: 80, passed: true, reason: '' })).toEqual({
      ok: false,
      errors: { reason: 'Say why the grade changes' },
    })
  })

  it('keeps the score between 0 and 100', () => {
    const result = checkOverride({ score: 140, passed: true, reason: 'Meter was faulty on the bench' })
    expect(result).toEqual({ ok: false, errors: { score: 'Enter a score from 0 to 100' } })
  })

  it('accepts a score with a reason', () => {
    expect(checkOverride({ score: '72', passed: true, reason: 'Proved dead with a second meter' })).toEqual({
      ok: true,
      body: { score: 72, passed: true, reason: 'Proved dead with a second meter' },
    })
  })
})

describe('the gradebook query', () => {
  it('passes the table sort, page and filters to the server', () => {
    const query = toGradebookQuery(
      { page: 2, itemsPerPage: 25, sortBy: [{ key: 'average', order: 'desc' }] },
      { q: '  wren ', status: 'failed', assignmentId: ids.assignment },
    )
    expect(query).toEqual({
      page: 2,
      pageSize: 25,
      sort: 'average',
      order: 'desc',
      q: 'wren',
      status: 'failed',
      assignmentId: ids.assignment,
    })
  })

  it('falls back to sorting by name for a column the server cannot sort', () => {
    const query = toGradebookQuery(
      { page: 1, itemsPerPage: 10, sortBy: [{ key: 'cell0', order: 'asc' }] },
      { q: '', status: null, assignmentId: null },
    )
    expect(query).toEqual({ page: 1, pageSize: 10, sort: 'name', order: 'asc' })
  })

  it('caps "all rows" (-1) at the server’s page limit', () => {
    const query = toGradebookQuery(
      { page: 1, itemsPerPage: -1, sortBy: [] },
      { q: '', status: null, assignmentId: null },
    )
    expect(query.pageSize).toBe(100)
  })
})

describe('the exception form', () => {
  const form = {
    ownDueDate: true,
    dueAt: '2026-12-15T17:00',
    extraAttempts: 1,
    excused: false,
    reason: 'Bench 3 was out of service',
  }

  it('sends every field, so all the apprentices chosen end up with the same terms', () => {
    const result = checkExceptionForm([ids.user], form)
    expect(result.ok).toBe(true)
    if (result.ok) {
      expect(result.body).toMatchObject({ userIds: [ids.user], extraAttempts: 1, excused: false })
      expect(Date.parse(result.body.dueAt!)).not.toBeNaN()
    }
    const back = checkExceptionForm([ids.user], { ...form, ownDueDate: false })
    expect(back.ok && back.body.dueAt).toBeNull()
  })

  it('asks for a reason, a due date when one is wanted, and a sensible number of attempts', () => {
    expect(checkExceptionForm([ids.user], { ...form, reason: '  ' })).toEqual({
      ok: false,
      errors: { reason: 'Say why (it is kept with the exception)' },
    })
    expect(checkExceptionForm([ids.user], { ...form, dueAt: '' })).toEqual({
      ok: false,
      errors: { dueAt: 'Choose their due date' },
    })
    const many = checkExceptionForm([ids.user], { ...form, extraAttempts: 'lots' })
    expect(many.ok || many.errors.extraAttempts).toBe('A whole number from 0 to 50')
  })

  it('describes an exception in words', () => {
    expect(exceptionText({ extended: false, dueAt: null, extraAttempts: 0, excused: false })).toBe('')
    expect(exceptionText({ extended: false, dueAt: null, extraAttempts: 2, excused: true })).toBe(
      'Excused · 2 extra attempts',
    )
  })
})
