// Platform roles → Slipway roles. LTI 1.3 roles are URIs from the LIS vocabulary (LTI Core 1.3 §A.2):
// context roles (membership#Instructor …), their sub-roles (membership/Instructor#TeachingAssistant …) and
// institution roles (institution/person#Faculty …). A platform can never make anyone a Slipway admin.
import type { Role } from '@shared/api/auth'

const MEMBERSHIP = 'http://purl.imsglobal.org/vocab/lis/v2/membership'
const INSTITUTION = 'http://purl.imsglobal.org/vocab/lis/v2/institution/person'

/** Context roles that teach the course: its instructors, content developers and administrators. */
const TEACHING_CONTEXT_ROLES = ['Instructor', 'ContentDeveloper', 'Administrator']
/** Institution roles that count only when the launch names no context role. */
const TEACHING_INSTITUTION_ROLES = ['Faculty', 'Instructor', 'Administrator']

/** The principal role a role URI names (a sub-role counts as its principal role), with its vocabulary. */
function principal(uri: string): { vocabulary: 'context' | 'institution' | 'other'; name: string } {
  // LTI 1.1-style short names ("Instructor") are deprecated but still sent by some platforms (§A.2.4).
  if (!uri.includes('/')) return { vocabulary: 'context', name: uri }
  if (uri.startsWith(`${MEMBERSHIP}#`))
    return { vocabulary: 'context', name: uri.slice(MEMBERSHIP.length + 1) }
  if (uri.startsWith(`${MEMBERSHIP}/`)) {
    // membership/Instructor#TeachingAssistant → Instructor
    return { vocabulary: 'context', name: uri.slice(MEMBERSHIP.length + 1).split('#')[0]! }
  }
  if (uri.startsWith(`${INSTITUTION}#`)) {
    return { vocabulary: 'institution', name: uri.slice(INSTITUTION.length + 1) }
  }
  return { vocabulary: 'other', name: uri }
}

/** instructor when the person teaches the course, else apprentice (learners, mentors, guests, anyone else). */
export function slipwayRoleOf(roleUris: readonly string[]): Exclude<Role, 'admin'> {
  const roles = roleUris.map(principal)
  const context = roles.filter((r) => r.vocabulary === 'context')
  if (context.length) {
    return context.some((r) => TEACHING_CONTEXT_ROLES.includes(r.name)) ? 'instructor' : 'apprentice'
  }
  return roles.some((r) => r.vocabulary === 'institution' && TEACHING_INSTITUTION_ROLES.includes(r.name))
    ? 'instructor'
    : 'apprentice'
}

/** NRPS member status: only active members are enrolled (NRPS 2.0 §2.4; absent means Active). */
export const isActiveMember = (status: string | undefined) =>
  status === undefined || status.toLowerCase() === 'active'
