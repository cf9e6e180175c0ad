// The centre's settings (name, time zone). Other features read the time zone through centreTimeZone():
// dates in mail, CSV files and printed records are shown on the centre's clock.
import { randomUUID } from 'node:crypto'
import type { DataSource, EntityManager } from 'typeorm'
import type { CentreSettings, UpdateCentreSettingsRequest } from '@shared/api/centre'
import { DEFAULT_TIME_ZONE } from '@shared/time/zone'
import type { AppContext } from '../context'
import { AuditEntryEntity, CentreSettingsEntity, type CentreSettingsRow, type UserRow } from '../entities'
import { nowIso } from '../infrastructure/clock'
import { DEFAULT_CENTRE_NAME, presentCentreSettings } from './centre.presenter'

export const CENTRE_ID = 'centre'

/** The stored settings, or the defaults before an admin has saved any. */
export async function readCentreSettings(ds: DataSource | EntityManager): Promise<CentreSettingsRow | null> {
  return ds.getRepository(CentreSettingsEntity).findOneBy({ id: CENTRE_ID })
}

/** The IANA time zone every date is shown in (UTC until an admin chooses one). */
export async function centreTimeZone(ds: DataSource | EntityManager): Promise<string> {
  return (await readCentreSettings(ds))?.timeZone ?? DEFAULT_TIME_ZONE
}

export async function getCentreSettings(ctx: AppContext): Promise<CentreSettings> {
  return presentCentreSettings(await readCentreSettings(ctx.dataSource))
}

/** Admins only (the route checks the role); the change is audited. */
export async function updateCentreSettings(
  ctx: AppContext,
  user: UserRow,
  changes: UpdateCentreSettingsRequest,
): Promise<CentreSettings> {
  return ctx.dataSource.transaction(async (manager) => {
    const repo = manager.getRepository(CentreSettingsEntity)
    const before = await repo.findOneBy({ id: CENTRE_ID })
    const next: CentreSettingsRow = {
      id: CENTRE_ID,
      name: changes.name ?? before?.name ?? DEFAULT_CENTRE_NAME,
      timeZone: changes.timeZone ?? before?.timeZone ?? DEFAULT_TIME_ZONE,
      updatedAt: nowIso(),
    }
    await repo.save(next)
    await manager.getRepository(AuditEntryEntity).insert({
      id: randomUUID(),
      actorId: user.id,
      action: 'centre.updated',
      entityType: 'centre',
      entityId: CENTRE_ID,
      fromValue: before ? JSON.stringify({ name: before.name, timeZone: before.timeZone }) : null,
      toValue: JSON.stringify({ name: next.name, timeZone: next.timeZone }),
      reason: 'Centre settings changed',
      createdAt: next.updatedAt,
    })
    return presentCentreSettings(next)
  })
}
