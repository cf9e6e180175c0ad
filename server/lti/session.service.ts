// The session a launch starts. The launch's one-time code becomes an access token (kept in the page's
// memory, as for any sign-in) and a refresh token in a cookie the browser keeps even inside the platform's
// frame: SameSite=None; Secure; Partitioned (CHIPS), so it belongs to this platform's site only and is sent
// to /api/lti/session alone. The standalone sign-in's SameSite=Strict cookie would never reach a frame.
import { IsNull, MoreThan } from 'typeorm'
import { launchDestinationSchema, type LaunchSession } from '@shared/api/lti'
import type { AppContext } from '../context'
import { LtiHandoffEntity, LtiPlatformEntity, UserEntity } from '../entities'
import { HttpError } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'
import { hashToken } from '../infrastructure/security/tokens'
import { startSession, type IssuedSession } from '../auth/sessions.service'

export interface IssuedLaunchSession {
  session: LaunchSession
  refreshToken: string
}

export async function exchangeLaunchCode(ctx: AppContext, code: string): Promise<IssuedLaunchSession> {
  const ds = ctx.dataSource
  const codeHash = hashToken(code)
  // Spent atomically, and only while fresh: a code read from a history entry later opens nothing.
  const spent = await ds
    .getRepository(LtiHandoffEntity)
    .update({ codeHash, usedAt: IsNull(), expiresAt: MoreThan(nowIso()) }, { usedAt: nowIso() })
  if (!spent.affected) {
    throw new HttpError(
      400,
      'lti_launch_invalid',
      'This launch link has expired or was already used. Open the activity again from your course.',
    )
  }
  const handoff = await ds.getRepository(LtiHandoffEntity).findOneByOrFail({ codeHash })
  const user = await findById(ds, UserEntity, handoff.userId)
  if (!user?.active) throw new HttpError(401, 'account_inactive', 'This account has been deactivated')
  const platform = await findById(ds, LtiPlatformEntity, handoff.platformId)
  await ds.getRepository(UserEntity).update({ id: user.id }, { lastSignInAt: nowIso() })
  const issued: IssuedSession = await startSession(ctx, user)
  return {
    session: {
      ...issued.session,
      destination: launchDestinationSchema.parse(JSON.parse(handoff.destination)),
      platformName: platform?.name ?? 'your learning platform',
    },
    refreshToken: issued.refreshToken,
  }
}
