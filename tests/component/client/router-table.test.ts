// The route table: every screen is lazy and has the roles the issue asks for.
import { describe, expect, it } from 'vitest'
import { routes } from '@/router/routes'

const byName = (name: string) => routes.find((r) => r.name === name)

describe('the route table', () => {
  it('loads every view lazily, so the sign-in page carries no other screen', () => {
    for (const route of routes) {
      expect(typeof route.component, String(route.name)).toBe('function')
      expect(String(route.component)).toMatch(/import/)
    }
  })

  it.each([
    ['gradebook', ['instructor', 'admin']],
    ['cohort-detail', ['instructor', 'admin']],
    ['scenario-edit', ['instructor', 'admin']],
    ['scenario-compare', ['instructor', 'admin']],
    ['admin-outbox', ['admin']],
    ['admin-backup', ['admin']],
    ['attempt-history', ['apprentice']],
  ])('limits %s to %j', (name, roles) => {
    expect(byName(name)?.meta?.roles).toEqual(roles)
  })

  it('keeps the invitation and password-reset pages open without signing in', () => {
    for (const name of ['sign-in', 'accept-invitation', 'reset-password', 'forgot-password', 'about']) {
      expect(byName(name)?.meta?.public, name).toBe(true)
    }
  })
})
