// What the LTI feature keeps per app between requests: the platforms' key sets, service access tokens and
// the origins allowed to frame Slipway. One per AppContext, made on first use. (Grades go back through the
// durable job queue: score-post-job.ts.)
import type { AppContext } from '../context'
import { createFrameOriginCache, type FrameOriginCache } from './frame-origins'
import { createPlatformKeyCache, type PlatformKeyCache, type PlatformKeyCacheOptions } from './platform-keys'
import { createServiceTokenCache, type ServiceTokenCache } from './platform-client'

export interface LtiOptions {
  platformKeys?: PlatformKeyCacheOptions
}

export interface LtiRuntime {
  platformKeys: PlatformKeyCache
  serviceTokens: ServiceTokenCache
  frameOrigins: FrameOriginCache
}

const runtimes = new WeakMap<AppContext, LtiRuntime>()

export function ltiRuntime(ctx: AppContext, options: LtiOptions = {}): LtiRuntime {
  let runtime = runtimes.get(ctx)
  if (runtime) return runtime
  runtime = {
    platformKeys: createPlatformKeyCache(options.platformKeys),
    serviceTokens: createServiceTokenCache(),
    frameOrigins: createFrameOriginCache(ctx.dataSource),
  }
  runtimes.set(ctx, runtime)
  return runtime
}
