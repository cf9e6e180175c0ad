// Who may open what: route meta typing and the role rules the guard applies.
import 'vue-router'

export type Role = 'apprentice' | 'instructor' | 'admin'

declare module 'vue-router' {
  interface RouteMeta {
    /** Open without signing in (sign-in, invitation, password reset, about). */
    public?: boolean
    /** Only for signed-out visitors: a signed-in user is sent home instead. */
    guestOnly?: boolean
    /** Roles allowed; absent means any signed-in user. */
    roles?: Role[]
    /** Title shown in the browser tab. */
    title?: string
    /** A full-width workspace (the simulator): the navigation drawer opens over it instead of beside it. */
    workspace?: boolean
  }
}

export const STAFF: Role[] = ['instructor', 'admin']

/** The landing page for each role. */
export function homeFor(role: Role): string {
  if (role === 'admin') return '/admin/users'
  if (role === 'instructor') return '/teach'
  return '/learn'
}
