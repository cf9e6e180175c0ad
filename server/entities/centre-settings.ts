// The training centre's own settings: one row (id 'centre'), edited by admins.
import { EntitySchema } from 'typeorm'
import { timestamp, varchar } from './columns'

export interface CentreSettingsRow {
  id: string
  name: string
  /** IANA time zone name; dates on screen, in mail and in files are shown on this clock. */
  timeZone: string
  updatedAt: string
}

export const CentreSettingsEntity = new EntitySchema<CentreSettingsRow>({
  name: 'CentreSettings',
  tableName: 'centre_settings',
  columns: {
    id: { ...varchar(16), primary: true },
    name: varchar(120),
    timeZone: varchar(64),
    updatedAt: timestamp,
  },
})
