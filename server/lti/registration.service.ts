// Platform registrations, kept by admins: the platform's issuer, the client id it gave Slipway, its
// deployments and the addresses Slipway calls; and the values a platform's administrator enters in return.
import { randomUUID } from 'node:crypto'
import { In } from 'typeorm'
import type { CreatePlatformRequest, Platform, ToolConfiguration } from '@shared/api/lti'
import type { AppContext } from '../context'
import {
  LtiContextEntity,
  LtiDeploymentEntity,
  LtiIdentityEntity,
  LtiPlatformEntity,
  type LtiPlatformRow,
} from '../entities'
import { conflict, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { TOOL_SCOPES } from './claims'
import { presentPlatform } from './platform.presenter'
import { listToolKeys, rotateKey } from './tool-keys'

type CreatePlatform = { [K in keyof CreatePlatformRequest]-?: Exclude<CreatePlatformRequest[K], undefined> }
type UpdatePlatform = Partial<CreatePlatform>

/** Slipway's own addresses, from the public base URL every platform reaches it by. */
export function toolUrls(ctx: AppContext) {
  const base = ctx.config.publicBaseUrl
  return {
    login: `${base}/api/lti/login`,
    launch: `${base}/api/lti/launch`,
    jwks: `${base}/api/lti/jwks`,
  }
}

export async function toolConfiguration(ctx: AppContext): Promise<ToolConfiguration> {
  const urls = toolUrls(ctx)
  return {
    loginInitiationUrl: urls.login,
    launchUrl: urls.launch,
    redirectUris: [urls.launch],
    jwksUrl: urls.jwks,
    deepLinkingUrl: urls.launch,
    scopes: TOOL_SCOPES,
    keys: await listToolKeys(ctx.dataSource),
  }
}

export async function rotateToolKey(ctx: AppContext): Promise<ToolConfiguration> {
  await rotateKey(ctx.dataSource)
  return toolConfiguration(ctx)
}

async function presentPlatforms(ctx: AppContext, rows: LtiPlatformRow[]): Promise<Platform[]> {
  if (rows.length === 0) return []
  const ds = ctx.dataSource
  const ids = rows.map((r) => r.id)
  const deployments = await ds.getRepository(LtiDeploymentEntity).find({
    where: { platformId: In(ids) },
    order: { createdAt: 'ASC' },
  })
  const countBy = async (entity: typeof LtiIdentityEntity | typeof LtiContextEntity) => {
    const raw: { platformId: string; n: string | number }[] = await ds
      .getRepository(entity)
      .createQueryBuilder('row')
      .select('row.platformId', 'platformId')
      .addSelect('COUNT(*)', 'n')
      .where('row.platformId IN (:...ids)', { ids })
      .groupBy('row.platformId')
      .getRawMany()
    return new Map(raw.map((r) => [r.platformId, Number(r.n)]))
  }
  const people = await countBy(LtiIdentityEntity)
  const courses = await countBy(LtiContextEntity)
  return rows.map((row) =>
    presentPlatform(row, {
      deploymentIds: deployments.filter((d) => d.platformId === row.id).map((d) => d.deploymentId),
      linkedPeople: people.get(row.id) ?? 0,
      linkedCourses: courses.get(row.id) ?? 0,
    }),
  )
}

export async function listPlatforms(ctx: AppContext): Promise<Platform[]> {
  const rows = await ctx.dataSource.getRepository(LtiPlatformEntity).find({ order: { name: 'ASC' } })
  return presentPlatforms(ctx, rows)
}

async function platformRow(ctx: AppContext, id: string): Promise<LtiPlatformRow> {
  const row = await ctx.dataSource.getRepository(LtiPlatformEntity).findOneBy({ id })
  if (!row) throw notFound('Platform')
  return row
}

export async function getPlatform(ctx: AppContext, id: string): Promise<Platform> {
  return (await presentPlatforms(ctx, [await platformRow(ctx, id)]))[0]!
}

async function assertNoOtherRegistration(ctx: AppContext, issuer: string, clientId: string, except?: string) {
  const same = await ctx.dataSource.getRepository(LtiPlatformEntity).findOneBy({ issuer, clientId })
  if (same && same.id !== except) {
    throw conflict('conflict', `"${same.name}" is already registered with this issuer and client id`)
  }
}

async function replaceDeployments(ctx: AppContext, platformId: string, deploymentIds: string[]) {
  await ctx.dataSource.transaction(async (manager) => {
    const repo = manager.getRepository(LtiDeploymentEntity)
    await repo.delete({ platformId })
    await repo.insert(
      deploymentIds.map((deploymentId) => ({
        id: randomUUID(),
        platformId,
        deploymentId,
        createdAt: nowIso(),
      })),
    )
  })
}

export async function createPlatform(ctx: AppContext, body: CreatePlatform): Promise<Platform> {
  await assertNoOtherRegistration(ctx, body.issuer, body.clientId)
  const now = nowIso()
  const row: LtiPlatformRow = {
    id: randomUUID(),
    name: body.name,
    issuer: body.issuer,
    clientId: body.clientId,
    authorizationEndpoint: body.authorizationEndpoint,
    tokenEndpoint: body.tokenEndpoint,
    jwksUrl: body.jwksUrl,
    extraFrameOrigins: JSON.stringify(body.extraFrameOrigins),
    createdAt: now,
    updatedAt: now,
    lastLaunchAt: null,
  }
  await ctx.dataSource.getRepository(LtiPlatformEntity).insert(row)
  await replaceDeployments(ctx, row.id, body.deploymentIds)
  return getPlatform(ctx, row.id)
}

/** The issuer is the platform's identity (people are matched by it): register a new platform to change it. */
export async function updatePlatform(
  ctx: AppContext,
  id: string,
  changes: UpdatePlatform,
): Promise<Platform> {
  const row = await platformRow(ctx, id)
  const { deploymentIds, extraFrameOrigins, issuer: _issuer, ...fields } = changes
  if (fields.clientId && fields.clientId !== row.clientId) {
    await assertNoOtherRegistration(ctx, row.issuer, fields.clientId, row.id)
  }
  await ctx.dataSource.getRepository(LtiPlatformEntity).update(
    { id },
    {
      ...fields,
      ...(extraFrameOrigins ? { extraFrameOrigins: JSON.stringify(extraFrameOrigins) } : {}),
      updatedAt: nowIso(),
    },
  )
  if (deploymentIds) await replaceDeployments(ctx, id, deploymentIds)
  return getPlatform(ctx, id)
}

/** Only a registration nobody has come in through may go: its people and courses are linked to it. */
export async function deletePlatform(ctx: AppContext, id: string): Promise<void> {
  const [platform] = await presentPlatforms(ctx, [await platformRow(ctx, id)])
  if (platform!.linkedPeople > 0 || platform!.linkedCourses > 0) {
    throw conflict(
      'conflict',
      'People and courses have already come in through this platform, so its registration stays ' +
        '(they are linked to it). Change its details instead.',
    )
  }
  await ctx.dataSource.getRepository(LtiPlatformEntity).delete({ id })
}
