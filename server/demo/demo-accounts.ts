// The invented demo training centre and its sign-ins (README and browser tests read them from here).
import type { Role } from '@shared/api/auth'

export const DEMO_CENTRE = 'Kestrel Vale Electrical Training Centre'
export const DEMO_DOMAIN = 'kestrelvale.example'
/** One shared demo password that meets the policy (12+ characters). */
export const DEMO_PASSWORD = 'slipway-demo-bench'

export interface DemoAccount {
  role: Role
  name: string
  email: string
  password: string
  /** Index into DEMO_COHORTS: the cohort an instructor owns or an apprentice is enrolled in. */
  cohort?: number
}

export const DEMO_COHORTS = [
  {
    name: 'Autumn intake — drives and controls 1',
    description: 'Year-one apprentices, Tuesday and Thursday bench sessions.',
  },
  {
    name: 'Spring intake — drives and controls 1',
    description: 'Year-one apprentices, Monday bench sessions.',
  },
]

const person = (role: Role, name: string, cohort?: number): DemoAccount => ({
  role,
  name,
  email: `${name.toLowerCase().replace(/[^a-z]+/g, '.')}@${DEMO_DOMAIN}`,
  password: DEMO_PASSWORD,
  cohort,
})

export const DEMO_ACCOUNTS: DemoAccount[] = [
  { role: 'admin', name: 'Morwenna Tallis', email: `admin@${DEMO_DOMAIN}`, password: DEMO_PASSWORD },
  person('instructor', 'Idris Penhallow', 0),
  person('instructor', 'Oona Fairbrass', 1),
  person('apprentice', 'Ravi Lindqvist', 0),
  person('apprentice', 'Ffion Achterberg', 0),
  person('apprentice', 'Callum Oyelaran', 0),
  person('apprentice', 'Zofia Brennock', 0),
  person('apprentice', 'Tomasz Quarrie', 0),
  person('apprentice', 'Aroha Wetherill', 0),
  person('apprentice', 'Nkem Halvorsen', 1),
  person('apprentice', 'Isla Varga-Pemberton', 1),
  person('apprentice', 'Dario Fenwick-Asante', 1),
  person('apprentice', 'Saoirse Mulrooney', 1),
  person('apprentice', 'Kenji Tregarthen', 1),
  person('apprentice', 'Priya Ashdown', 1),
]

/** A short table for the start-up banner: admin, instructors and the first apprentice of each cohort. */
export function demoSignInTable(): string {
  const shown = DEMO_ACCOUNTS.filter(
    (a, i) =>
      a.role !== 'apprentice' ||
      DEMO_ACCOUNTS.findIndex((b) => b.role === 'apprentice' && b.cohort === a.cohort) === i,
  )
  const width = Math.max(...shown.map((a) => a.email.length))
  const lines = shown.map((a) => `  ${a.role.padEnd(10)}  ${a.email.padEnd(width)}  ${a.name}`)
  return [
    `Demo sign-ins (${DEMO_CENTRE}); password for all: ${DEMO_PASSWORD}`,
    ...lines,
    `  … and ${DEMO_ACCOUNTS.length - shown.length} more apprentices at @${DEMO_DOMAIN}`,
  ].join('\n')
}
