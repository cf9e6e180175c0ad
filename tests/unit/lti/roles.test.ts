// Platform roles → Slipway roles, with the role URIs of the LIS vocabulary as LTI Core 1.3 §A.2 lists them.
import { describe, expect, it } from 'vitest'
import { isActiveMember, slipwayRoleOf } from '../../../server/lti/roles'
import { nextPageUrl } from '../../../server/lti/roster.service'

const M = 'http://purl.imsglobal.org/vocab/lis/v2/membership'
const I = 'http://purl.imsglobal.org/vocab/lis/v2/institution/person'

describe('slipwayRoleOf', () => {
  it('makes a course instructor, content developer or course administrator an instructor', () => {
    expect(slipwayRoleOf([`${M}#Instructor`])).toBe('instructor')
    expect(slipwayRoleOf([`${M}#ContentDeveloper`])).toBe('instructor')
    expect(slipwayRoleOf([`${M}#Administrator`])).toBe('instructor')
  })

  it('counts a sub-role as its principal role (a teaching assistant is an instructor; §A.2.3.1)', () => {
    expect(slipwayRoleOf([`${M}/Instructor#TeachingAssistant`])).toBe('instructor')
    expect(slipwayRoleOf([`${M}/Learner#NonCreditLearner`])).toBe('apprentice')
  })

  it('makes learners, mentors and anyone unrecognised an apprentice', () => {
    expect(slipwayRoleOf([`${M}#Learner`])).toBe('apprentice')
    expect(slipwayRoleOf([`${M}#Mentor`])).toBe('apprentice')
    expect(slipwayRoleOf([])).toBe('apprentice')
    expect(slipwayRoleOf(['http://example.com/roles#Wizard'])).toBe('apprentice')
  })

  it('lets a context role decide over an institution role (faculty taking a course as a learner)', () => {
    expect(slipwayRoleOf([`${I}#Faculty`, `${M}#Learner`])).toBe('apprentice')
    expect(slipwayRoleOf([`${I}#Faculty`])).toBe('instructor')
    expect(slipwayRoleOf([`${I}#Student`])).toBe('apprentice')
  })

  it('reads the deprecated short names some platforms still send (§A.2.4)', () => {
    expect(slipwayRoleOf(['Instructor'])).toBe('instructor')
    expect(slipwayRoleOf(['Learner'])).toBe('apprentice')
  })

  it('never makes anyone an admin (a platform administrator is not a Slipway admin)', () => {
    expect(slipwayRoleOf([`${I}#Administrator`, `${M}#Administrator`])).toBe('instructor')
  })
})

describe('roster pages and member status (NRPS 2.0)', () => {
  it('follows the next link of a Link header (RFC 8288), whatever else it lists', () => {
    expect(
      nextPageUrl('<https://lms.example/m?p=2>; rel="next", <https://lms.example/m?p=9>; rel="last"'),
    ).toBe('https://lms.example/m?p=2')
    expect(nextPageUrl('<https://lms.example/m?p=1>; rel="first"')).toBeUndefined()
    expect(nextPageUrl(null)).toBeUndefined()
  })

  it('treats a member without a status as active (§2.4)', () => {
    expect(isActiveMember(undefined)).toBe(true)
    expect(isActiveMember('Active')).toBe(true)
    expect(isActiveMember('Inactive')).toBe(false)
    expect(isActiveMember('Deleted')).toBe(false)
  })
})
