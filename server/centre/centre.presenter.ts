// The centre settings row → the API's CentreSettings (defaults before any are saved).
import type { CentreSettings } from '@shared/api/centre'
import { DEFAULT_TIME_ZONE } from '@shared/time/zone'
import type { CentreSettingsRow } from '../entities'

export const DEFAULT_CENTRE_NAME = 'Training centre'

export const presentCentreSettings = (row: CentreSettingsRow | null): CentreSettings => ({
  name: row?.name ?? DEFAULT_CENTRE_NAME,
  timeZone: row?.timeZone ?? DEFAULT_TIME_ZONE,
  updatedAt: row?.updatedAt ?? null,
})
