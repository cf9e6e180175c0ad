// The signed-in user and the access token (kept in memory only; the refresh token is an httpOnly cookie).
import { browserStorage } from '@/composables/browserStorage'
import { computed, ref } from 'vue'
import { defineStore } from 'pinia'
import type { ChangePasswordRequest, LaunchSession, SessionResponse, SignInRequest, User } from '@shared/api'
import { connectAuth, request, requestVoid } from '@/api/client'
import { endpoints } from '@/api/endpoints'
import type { GuardSession } from '@/router/guard'

// The schemas (and zod with them) load on first use, which keeps them off the sign-in page's first load.
const authSchemas = () => import('@shared/api/auth')

// A hint (not a secret) that this browser has had a session, so a first visit skips a refresh
// call that can only fail; the refresh cookie itself is httpOnly and invisible to scripts.
const HAD_SESSION_KEY = 'slipway.hadSession'
// A session started by a learning platform's launch (often inside its frame) refreshes through its own
// partitioned cookie and route; the mark lives in sessionStorage, so it belongs to this tab or frame only.
const FRAMED_KEY = 'slipway.launchedSession'
const ltiSchemas = () => import('@shared/api/lti')

export const useSessionStore = defineStore('session', () => {
  const user = ref<User | null>(null)
  const accessToken = ref<string | null>(null)
  /** True once the page has tried to resume a session from the refresh cookie. */
  const restored = ref(false)
  /** Set when a session ended on its own (expired or revoked), so the sign-in page can say so. */
  const endedUnexpectedly = ref(false)

  /** True when this tab's session came from a learning platform's launch. */
  // Inside a frame a session can only have come from a launch (Slipway is framed by platforms only), and the
  // browser may refuse the frame any storage: then the partitioned refresh cookie is all there is.
  const inFrame = window.self !== window.top
  const launched = ref(inFrame || browserStorage('sessionStorage').getItem(FRAMED_KEY) === '1')

  const signedIn = computed(() => user.value !== null && accessToken.value !== null)
  const role = computed(() => user.value?.role ?? null)

  function adopt(session: SessionResponse) {
    accessToken.value = session.accessToken
    user.value = session.user
    endedUnexpectedly.value = false
    browserStorage('localStorage').setItem(HAD_SESSION_KEY, '1')
  }

  function clear() {
    accessToken.value = null
    user.value = null
    browserStorage('localStorage').removeItem(HAD_SESSION_KEY)
    browserStorage('sessionStorage').removeItem(FRAMED_KEY)
    launched.value = inFrame
  }

  async function refresh(): Promise<boolean> {
    try {
      const { sessionResponseSchema } = await authSchemas()
      const path = launched.value ? endpoints.lti.refresh : endpoints.auth.refresh
      const session = await request(path, sessionResponseSchema, { method: 'POST', refreshOn401: false })
      if (launched.value) {
        accessToken.value = session.accessToken
        user.value = session.user
      } else adopt(session)
      return true
    } catch {
      return false
    }
  }

  let restoring: Promise<void> | null = null
  /** Resumes a session once per page load; later calls wait for the same attempt. */
  function restore(): Promise<void> {
    if (restored.value) return Promise.resolve()
    if (!launched.value && !browserStorage('localStorage').getItem(HAD_SESSION_KEY)) {
      restored.value = true
      return Promise.resolve()
    }
    restoring ??= refresh().then(() => {
      restored.value = true
    })
    return restoring
  }

  async function signIn(credentials: SignInRequest) {
    const { sessionResponseSchema } = await authSchemas()
    adopt(
      await request(endpoints.auth.signIn, sessionResponseSchema, {
        method: 'POST',
        body: credentials,
        refreshOn401: false,
      }),
    )
    restored.value = true
    return user.value as User
  }

  /** Swaps a launch's one-time code for a session; says where the launch leads. */
  async function startLaunchedSession(code: string): Promise<LaunchSession> {
    const { launchSessionSchema } = await ltiSchemas()
    const launch = await request(endpoints.lti.session, launchSessionSchema, {
      method: 'POST',
      body: { code },
      refreshOn401: false,
    })
    accessToken.value = launch.accessToken
    user.value = launch.user
    endedUnexpectedly.value = false
    browserStorage('sessionStorage').setItem(FRAMED_KEY, '1')
    launched.value = true
    restored.value = true
    return launch
  }

  async function signOut() {
    try {
      const path = launched.value ? endpoints.lti.signOut : endpoints.auth.signOut
      await requestVoid(path, { method: 'POST', refreshOn401: false })
    } finally {
      clear()
    }
  }

  async function signOutEverywhere() {
    try {
      await requestVoid(endpoints.auth.signOutEverywhere, { method: 'POST' })
    } finally {
      clear()
    }
  }

  async function reloadMe() {
    const { meResponseSchema } = await authSchemas()
    user.value = (await request(endpoints.auth.me, meResponseSchema)).user
  }

  async function updateName(name: string) {
    const { meResponseSchema } = await authSchemas()
    user.value = (
      await request(endpoints.auth.profile, meResponseSchema, { method: 'PATCH', body: { name } })
    ).user
  }

  /** The server ends every other session and starts a fresh one for this tab. */
  async function changePassword(body: ChangePasswordRequest) {
    const { sessionResponseSchema } = await authSchemas()
    adopt(await request(endpoints.auth.password, sessionResponseSchema, { method: 'POST', body }))
  }

  /** The plain snapshot the router guard needs (no component, no reactivity). */
  function guardState(): GuardSession {
    return { signedIn: signedIn.value, role: role.value }
  }

  connectAuth({
    accessToken: () => accessToken.value,
    refresh,
    signedOut: () => {
      if (user.value) endedUnexpectedly.value = true
      clear()
    },
  })

  return {
    user,
    accessToken,
    restored,
    endedUnexpectedly,
    signedIn,
    role,
    launched,
    startLaunchedSession,
    restore,
    refresh,
    startSession: adopt,
    signIn,
    signOut,
    signOutEverywhere,
    reloadMe,
    updateName,
    changePassword,
    guardState,
    clear,
  }
})
