// The navigation rule, kept pure so it can be tested without a router or a component.
import type { RouteLocationNormalized, RouteLocationRaw } from 'vue-router'
import { homeFor, type Role } from './roles'

export interface GuardSession {
  signedIn: boolean
  role: Role | null
}

type Target = Pick<RouteLocationNormalized, 'fullPath' | 'meta' | 'path'> & {
  matched?: { meta: RouteLocationNormalized['meta'] }[]
}

export function decide(to: Target, session: GuardSession): true | RouteLocationRaw {
  const metas = to.matched?.length ? to.matched.map((m) => m.meta) : [to.meta]
  const isPublic = metas.some((m) => m.public)
  const guestOnly = metas.some((m) => m.guestOnly)

  if (!session.signedIn || !session.role) {
    if (isPublic) return true
    return { path: '/sign-in', query: to.fullPath && to.fullPath !== '/' ? { redirect: to.fullPath } : {} }
  }
  if (guestOnly) return homeFor(session.role)
  if (to.path === '/') return homeFor(session.role)

  const role = session.role
  const refused = metas.some((m) => m.roles && !m.roles.includes(role))
  if (refused) return { name: 'forbidden', query: { from: to.fullPath } }
  return true
}

/** Only same-site paths are followed after sign-in (no open redirect). */
export function safeRedirect(value: unknown): string | null {
  if (typeof value !== 'string') return null
  if (!value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return null
  if (value.startsWith('/sign-in')) return null
  return value
}
