// The navigation rule: who may open which route, and where everyone else is sent.
import { describe, expect, it } from 'vitest'
import type { RouteMeta } from 'vue-router'
import { decide, safeRedirect } from '@/router/guard'
import { homeFor } from '@/router/roles'

const to = (fullPath: string, meta: RouteMeta = {}) => ({
  fullPath,
  path: fullPath.split('?')[0],
  meta,
  matched: [{ meta }],
})
const signedOut = { signedIn: false, role: null }
const apprentice = { signedIn: true, role: 'apprentice' as const }
const instructor = { signedIn: true, role: 'instructor' as const }
const admin = { signedIn: true, role: 'admin' as const }

describe('the route guard', () => {
  it('sends a signed-out visitor to sign-in and keeps where they were going', () => {
    expect(decide(to('/teach/gradebook?cohort=1', { roles: ['instructor'] }), signedOut)).toEqual({
      path: '/sign-in',
      query: { redirect: '/teach/gradebook?cohort=1' },
    })
  })

  it('lets a signed-out visitor open public pages', () => {
    expect(decide(to('/about', { public: true }), signedOut)).toBe(true)
    expect(decide(to('/invitation?token=abc', { public: true }), signedOut)).toBe(true)
  })

  it('shows the not-allowed page to an apprentice who types an instructor address', () => {
    expect(decide(to('/teach/gradebook', { roles: ['instructor', 'admin'] }), apprentice)).toEqual({
      name: 'forbidden',
      query: { from: '/teach/gradebook' },
    })
  })

  it('keeps admin pages from instructors', () => {
    expect(decide(to('/admin/outbox', { roles: ['admin'] }), instructor)).toMatchObject({ name: 'forbidden' })
  })

  it('lets an admin into the instructor screens', () => {
    expect(decide(to('/teach/cohorts', { roles: ['instructor', 'admin'] }), admin)).toBe(true)
  })

  it('sends a signed-in user away from the sign-in page to their own start page', () => {
    expect(decide(to('/sign-in', { public: true, guestOnly: true }), instructor)).toBe('/teach')
  })

  it('opens each role at its own start page', () => {
    expect(decide(to('/'), apprentice)).toBe(homeFor('apprentice'))
    expect(homeFor('apprentice')).toBe('/learn')
    expect(homeFor('instructor')).toBe('/teach')
    expect(homeFor('admin')).toBe('/admin/users')
  })

  it('follows only same-site paths after sign-in', () => {
    expect(safeRedirect('/teach/gradebook?cohort=1')).toBe('/teach/gradebook?cohort=1')
    expect(safeRedirect('//evil.example/steal')).toBeNull()
    expect(safeRedirect('https://evil.example')).toBeNull()
    expect(safeRedirect('/\\evil.example')).toBeNull()
    expect(safeRedirect('/sign-in?redirect=/x')).toBeNull()
    expect(safeRedirect(['/a'])).toBeNull()
  })
})
