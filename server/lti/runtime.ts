// What the LTI feature keeps per app between requests: the platforms' key sets, service access tokens, the
// grade sender and the origins allowed to frame Slipway. One per AppContext, made on first use.
import type { AppContext } from '../context'
import { createFrameOriginCache, type FrameOriginCache } from './frame-origins'
import { createPlatformKeyCache, type PlatformKeyCache, type PlatformKeyCacheOptions } from './platform-keys'
import { createServiceTokenCache, type ServiceTokenCache } from './platform-client'
import { createInProcessScoreQueue, type ScorePostQueue } from './score-queue'

export interface LtiOptions {
  platformKeys?: PlatformKeyCacheOptions
  /** Delays between tries of a grade post (default score-queue.ts DEFAULT_RETRY_DELAYS_MS). */
  scoreRetryDelaysMs?: number[]
}

export interface LtiRuntime {
  platformKeys: PlatformKeyCache
  serviceTokens: ServiceTokenCache
  scores: ScorePostQueue
  frameOrigins: FrameOriginCache
}

const runtimes = new WeakMap<AppContext, LtiRuntime>()

export function ltiRuntime(ctx: AppContext, options: LtiOptions = {}): LtiRuntime {
  let runtime = runtimes.get(ctx)
  if (runtime) return runtime
  runtime = {
    platformKeys: createPlatformKeyCache(options.platformKeys),
    serviceTokens: createServiceTokenCache(),
    // Imported lazily: passback.service imports this module.
    scores: createInProcessScoreQueue(
      async (post, attempt) => (await import('./passback.service')).postScore(ctx, post, attempt),
      {
        retryDelaysMs: options.scoreRetryDelaysMs,
        onError: (err) => ctx.log.error({ err }, 'sending a grade to a learning platform failed'),
      },
    ),
    frameOrigins: createFrameOriginCache(ctx.dataSource),
  }
  runtimes.set(ctx, runtime)
  return runtime
}

/** After a restart: grades that were waiting are sent again (their rows are the durable record). */
export async function resumeWaitingScores(ctx: AppContext): Promise<void> {
  const { waitingPosts } = await import('./passback.service')
  for (const post of await waitingPosts(ctx)) ltiRuntime(ctx).scores.enqueueScorePost(post)
}
