// A file received through an upload, kept under DATA_DIR/uploads with a generated name.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { integer, timestamp, uuidColumn, uuidPrimary, varchar, belongsTo } from './columns'

export interface UploadRow {
  id: string
  userId: string
  purpose: 'scenarioPack' | 'roster'
  originalName: string
  storedName: string
  mimeType: string
  size: number
  createdAt: string
}

export const UploadEntity = new EntitySchema<UploadRow>({
  name: 'Upload',
  tableName: 'uploads',
  columns: {
    id: uuidPrimary,
    userId: uuidColumn,
    purpose: varchar(32),
    originalName: varchar(255),
    storedName: varchar(80),
    mimeType: varchar(120),
    size: integer,
    createdAt: timestamp,
  },
  relations: {
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<UploadRow>['relations'],
})
