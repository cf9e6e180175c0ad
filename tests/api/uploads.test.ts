// Nothing half-written: an uploaded file is moved into place only after its transaction commits, a rolled-back
// upload leaves no file, and the sweep finishes or removes what a crash left behind.
import { randomUUID } from 'node:crypto'
import { existsSync, mkdirSync, readdirSync, utimesSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { pino } from 'pino'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { JobEntity, UploadEntity } from '../../server/entities'
import { STAGED_GRACE_MS, sweepUploads } from '../../server/infrastructure/storage/upload-sweep'
import { uploadFolders } from '../../server/infrastructure/storage/uploads'
import type { Cohort } from '../../shared/api'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { createCohort } from '../support/world'

const log = pino({ level: 'silent' })

describe('uploads', () => {
  let api: TestApi
  let instructor: TestUser
  let cohort: Cohort
  let folders: { kept: string; staging: string }
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
    instructor = await api.createUser('instructor')
    cohort = await createCohort(api, instructor, 'Upload cohort', [])
    folders = uploadFolders(api.dataDir)
  })
  afterAll(() => api.close())

  const files = (dir: string) =>
    existsSync(dir)
      ? readdirSync(dir, { withFileTypes: true })
          .filter((e) => e.isFile())
          .map((e) => e.name)
      : []
  const roster = (csv: string) =>
    supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations/roster`)
      .set(bearer(instructor.token))
      .attach('roster', Buffer.from(csv), { filename: 'roster.csv', contentType: 'text/csv' })

  it('keeps the file of a committed upload in place, under the name its row records', async () => {
    const response = await roster('email,name\nkept.person@slipway.test,Kept Person\n')
    expect(response.status).toBe(201)
    const rows = await api.dataSource.getRepository(UploadEntity).find()
    expect(rows).toHaveLength(1)
    expect(files(folders.kept)).toEqual([rows[0]!.storedName])
    expect(files(folders.staging)).toEqual([])
  })

  it('leaves no file and no row when the upload’s transaction rolls back', async () => {
    const before = files(folders.kept)
    const rows = await api.dataSource.getRepository(UploadEntity).count()
    // The second row is the instructor's own address: refused, so the whole roster is.
    const response = await roster(
      `email,name\nrolled.back@slipway.test,Rolled Back\n${instructor.email},Me\n`,
    )
    expect(response.status).toBe(400)
    expect(files(folders.kept)).toEqual(before)
    expect(files(folders.staging)).toEqual([])
    expect(await api.dataSource.getRepository(UploadEntity).count()).toBe(rows)
  })

  describe('the sweep', () => {
    const now = new Date()
    const longAgo = new Date(now.getTime() - STAGED_GRACE_MS - 60_000)
    function file(dir: string, name: string, at = now) {
      mkdirSync(dir, { recursive: true })
      writeFileSync(join(dir, name), 'email,name\n')
      utimesSync(join(dir, name), at, at)
      return name
    }
    async function recorded(storedName: string) {
      await api.dataSource.getRepository(UploadEntity).insert({
        id: randomUUID(),
        userId: instructor.user.id,
        purpose: 'roster',
        originalName: 'roster.csv',
        storedName,
        mimeType: 'text/csv',
        size: 11,
        createdAt: now.toISOString(),
      })
    }

    it('moves a committed upload’s staged file into place and removes old orphans, sparing recent files', async () => {
      const committed = file(folders.staging, `${randomUUID()}.csv`, longAgo)
      await recorded(committed)
      const abandoned = file(folders.staging, `${randomUUID()}.csv`, longAgo)
      const inFlight = file(folders.staging, `${randomUUID()}.csv`)
      const orphan = file(folders.kept, `${randomUUID()}.csv`, longAgo)
      const justPlaced = file(folders.kept, `${randomUUID()}.csv`)
      const lost = `${randomUUID()}.csv`
      await recorded(lost)

      const result = await sweepUploads(api.dataSource, api.dataDir, log, now)
      expect(result).toEqual({ placed: 1, removed: 2, missing: 1 })
      expect(files(folders.staging)).toEqual([inFlight])
      const kept = files(folders.kept)
      expect(kept).toContain(committed)
      expect(kept).toContain(justPlaced)
      expect(kept).not.toContain(orphan)
      expect(files(folders.staging)).not.toContain(abandoned)
    })

    it('runs every hour, at minute 17, as a job of the queue', async () => {
      await api.jobs.worker.runDue()
      const planned = await api.dataSource.getRepository(JobEntity).findBy({ kind: 'uploads.sweep' })
      expect(planned).toHaveLength(1)
      expect(new Date(planned[0]!.runAt).getUTCMinutes()).toBe(17)
      expect(planned[0]!.dedupeKey).toBe(`schedule:uploads.sweep:${planned[0]!.runAt}`)
    })
  })
})
