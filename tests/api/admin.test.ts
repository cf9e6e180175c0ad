// Admin: accounts (list, change role, deactivate, end sessions), the mail outbox and database backups.
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { outboxPageSchema, userPageSchema } from '../../shared/api'
import { AuditEntryEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'

describe('admin', () => {
  let api: TestApi
  let admin: TestUser
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
    admin = await api.createUser('admin', { name: 'Ottoline Marchbank' })
  })
  afterAll(() => api.close())

  const as = (user: TestUser) => ({
    get: (path: string) => supertest(api.app).get(path).set(bearer(user.token)),
    patch: (path: string, body: object) => supertest(api.app).patch(path).set(bearer(user.token)).send(body),
    post: (path: string, body?: object) => supertest(api.app).post(path).set(bearer(user.token)).send(body),
  })

  it('lists users, filtered by role and search, paged', async () => {
    await api.createUser('apprentice', { name: 'Searchable Quillon' })
    const response = await as(admin).get('/api/admin/users?role=apprentice&q=quillon')
    expect(response.status).toBe(200)
    const page = userPageSchema.parse(response.body)
    expect(page.items.map((u) => u.name)).toEqual(['Searchable Quillon'])
    expect(page.total).toBe(1)
  })

  it('changes a role, which ends the user’s sessions and is audited', async () => {
    const person = await api.createUser('apprentice')
    const response = await as(admin).patch(`/api/admin/users/${person.user.id}`, { role: 'instructor' })
    expect(response.status).toBe(200)
    expect(response.body.user.role).toBe('instructor')
    expect((await as(person).get('/api/auth/me')).status).toBe(401)
    const audit = await api.dataSource
      .getRepository(AuditEntryEntity)
      .findOneByOrFail({ entityId: person.user.id })
    expect(JSON.parse(audit.fromValue!)).toEqual({ role: 'apprentice', active: true })
    expect(JSON.parse(audit.toValue)).toEqual({ role: 'instructor', active: true })
    expect(audit.actorId).toBe(admin.user.id)
  })

  it('deactivates an account: its token stops working and it cannot sign in', async () => {
    const person = await api.createUser('apprentice')
    expect((await as(admin).patch(`/api/admin/users/${person.user.id}`, { active: false })).status).toBe(200)
    expect((await as(person).get('/api/auth/me')).status).toBe(401)
    const signIn = await supertest(api.app)
      .post('/api/auth/sign-in')
      .send({ email: person.email, password: person.password })
    expect(signIn.body.error.code).toBe('account_inactive')
  })

  it('does not let an admin demote or deactivate themself', async () => {
    const response = await as(admin).patch(`/api/admin/users/${admin.user.id}`, { active: false })
    expect(response.status).toBe(409)
  })

  it('ends every session of a user on request', async () => {
    const person = await api.createUser('instructor')
    expect((await as(admin).post(`/api/admin/users/${person.user.id}/sign-out`)).status).toBe(204)
    expect((await as(person).get('/api/auth/me')).status).toBe(401)
  })

  it('lists the mail Slipway sent, with its status and, in the local set-up, the message itself', async () => {
    await supertest(api.app).post('/api/auth/password-reset').send({ email: admin.email })
    await api.mail()
    const response = await as(admin).get(`/api/admin/outbox?to=${encodeURIComponent(admin.email)}`)
    const page = outboxPageSchema.parse(response.body)
    expect(page.items[0]).toMatchObject({
      subject: 'Reset your Slipway password',
      from: expect.stringContaining('no-reply@slipway.test'),
      status: 'sent',
      attempts: 1,
      lastError: null,
    })
    expect(page.items[0]!.to).toContain(admin.email)
    expect(page.items[0]!.body!.html).toContain('<a href=')
    expect(page.local).toBe(true)
  })

  it('downloads a consistent SQLite backup that opens and holds the users', async () => {
    const response = await supertest(api.app)
      .get('/api/admin/backup')
      .set(bearer(admin.token))
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = []
        res.on('data', (c: Buffer) => chunks.push(c))
        res.on('end', () => done(null, Buffer.concat(chunks)))
      })
    expect(response.status).toBe(200)
    expect(response.headers['content-disposition']).toMatch(
      /^attachment; filename="slipway-backup-[\w-]+\.sqlite"$/,
    )
    const body = response.body as Buffer
    expect(body.subarray(0, 16).toString('latin1')).toBe('SQLite format 3\u0000')
    const dir = mkdtempSync(join(tmpdir(), 'slipway-backup-check-'))
    try {
      const file = join(dir, 'copy.sqlite')
      writeFileSync(file, body)
      const copy = new Database(file, { readonly: true })
      const row = copy.prepare('SELECT name FROM users WHERE email = ?').get(admin.email) as { name: string }
      expect(row.name).toBe('Ottoline Marchbank')
      expect(copy.pragma('integrity_check', { simple: true })).toBe('ok')
      copy.close()
    } finally {
      rmSync(dir, { recursive: true, force: true })
    }
  })
})
