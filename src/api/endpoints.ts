// Every API path the client calls, in one place (the server's route table is the authority).
const enc = encodeURIComponent

export const endpoints = {
  auth: {
    signIn: '/auth/sign-in',
    refresh: '/auth/refresh',
    signOut: '/auth/sign-out',
    signOutEverywhere: '/auth/sign-out-everywhere',
    me: '/auth/me',
    profile: '/auth/me',
    password: '/auth/change-password',
    resetRequest: '/auth/password-reset',
    resetConfirm: '/auth/password-reset/confirm',
  },
  invitations: {
    preview: (token: string) => `/invitations/${enc(token)}`,
    accept: (token: string) => `/invitations/${enc(token)}/accept`,
  },
  cohorts: {
    list: '/cohorts',
    one: (id: string) => `/cohorts/${enc(id)}`,
    members: (id: string) => `/cohorts/${enc(id)}/members`,
    member: (id: string, userId: string) => `/cohorts/${enc(id)}/members/${enc(userId)}`,
    invitations: (id: string) => `/cohorts/${enc(id)}/invitations`,
    roster: (id: string) => `/cohorts/${enc(id)}/invitations/roster`,
    assignments: (id: string) => `/cohorts/${enc(id)}/assignments`,
    gradebook: (id: string) => `/cohorts/${enc(id)}/gradebook`,
    gradebookCsv: (id: string) => `/cohorts/${enc(id)}/gradebook.csv`,
  },
  scenarios: {
    list: '/scenarios',
    upload: '/scenarios/upload',
    byId: (id: string) => `/scenario-versions/${enc(id)}`,
    latest: (key: string) => `/scenarios/${enc(key)}`,
    versions: (key: string) => `/scenarios/${enc(key)}/versions`,
    version: (key: string, version: number) => `/scenarios/${enc(key)}/versions/${version}`,
    duplicate: (key: string) => `/scenarios/${enc(key)}/duplicate`,
    retire: (key: string) => `/scenarios/${enc(key)}/retire`,
    restore: (key: string) => `/scenarios/${enc(key)}/restore`,
  },
  assignments: {
    list: '/assignments',
    one: (id: string) => `/assignments/${enc(id)}`,
    stats: (id: string) => `/assignments/${enc(id)}/stats`,
  },
  attempts: {
    list: '/attempts',
    submit: '/attempts',
    one: (id: string) => `/attempts/${enc(id)}`,
    overview: (id: string) => `/attempts/${enc(id)}/overview`,
    feedback: (id: string) => `/attempts/${enc(id)}/feedback`,
    override: (id: string) => `/attempts/${enc(id)}/grade-override`,
  },
  admin: {
    users: '/admin/users',
    user: (id: string) => `/admin/users/${enc(id)}`,
    inviteInstructor: '/admin/invitations',
    outbox: '/admin/outbox',
    retryMessage: (id: string) => `/admin/outbox/${enc(id)}/retry`,
    backup: '/admin/backup',
  },
} as const
