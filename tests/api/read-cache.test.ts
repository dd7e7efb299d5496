/**
 * The read cache behind the shelf list, entry pages and bearer tokens (api/services/read-cache.ts):
 * an answer is served again only while none of its tables changed, through model writes,
 * bulk writes and transactions alike.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
let engineer: string
let entryId: number
beforeAll(async () => {
  t = await startTestApp()
  engineer = await signInAs(t.app, 'engineer')
  entryId = (await t.context.db.models.Entry.findOne({ where: { status: 'released' }, order: [['id', 'ASC']] }))!.id
})
afterAll(() => t.close())

const names = async () => ((await request(t.app).get('/api/entries').set(bearer(engineer)).expect(200)).body.entries as Array<{ id: number; name: string }>)
  .find((e) => e.id === entryId)!.name

describe('GET /api/entries from the cache', () => {
  it('answers the same list again, and the new one right after an entry is renamed', async () => {
    const first = await request(t.app).get('/api/entries').set(bearer(engineer))
    const again = await request(t.app).get('/api/entries').set(bearer(engineer))
    expect(again.text).toBe(first.text)
    expect(again.headers['content-type']).toMatch(/^application\/json/)
    const entry = (await t.context.db.models.Entry.findByPk(entryId))!
    await entry.update({ name: 'Renamed through an instance' })
    expect(await names()).toBe('Renamed through an instance')
    await t.context.db.models.Entry.update({ name: 'Renamed in bulk' }, { where: { id: entryId } })
    expect(await names()).toBe('Renamed in bulk')
  })

  it('does not keep a list read while a write transaction is open', async () => {
    let release!: () => void
    const held = new Promise<void>((r) => { release = r })
    const writing = t.context.db.write(async (transaction) => {
      await t.context.db.models.Entry.update({ name: 'Renamed in a transaction' }, { where: { id: entryId }, transaction })
      await held
    })
    // the read sees the committed name while the transaction is open
    expect(await names()).toBe('Renamed in bulk')
    release()
    await writing
    expect(await names()).toBe('Renamed in a transaction')
  })

  it('shows an owner\u2019s new display name', async () => {
    const entry = (await t.context.db.models.Entry.findByPk(entryId))!
    await t.context.db.models.User.update({ displayName: 'Nia Cachewell' }, { where: { id: entry.ownerId } })
    const listed = (await request(t.app).get('/api/entries').set(bearer(engineer))).body.entries.find((e: { id: number }) => e.id === entryId)
    expect(listed.owner.displayName).toBe('Nia Cachewell')
  })
})

describe('GET /api/entries/:id from the cache', () => {
  it('shows a new comment at once', async () => {
    const before = (await request(t.app).get(`/api/entries/${entryId}`).set(bearer(engineer)).expect(200)).body.entry
    const contributor = await signInAs(t.app, 'contributor')
    await request(t.app).post(`/api/entries/${entryId}/comments`).set(bearer(contributor)).send({ text: 'seen after the cache' }).expect(201)
    const after = (await request(t.app).get(`/api/entries/${entryId}`).set(bearer(engineer)).expect(200)).body.entry
    expect(after.comments.length).toBe(before.comments.length + 1)
  })
})

describe('a cached session', () => {
  it('is refused right after sign-out', async () => {
    const token = await signInAs(t.app, 'engineer')
    await request(t.app).get('/api/auth/me').set(bearer(token)).expect(200)
    await request(t.app).get('/api/auth/me').set(bearer(token)).expect(200)
    await request(t.app).post('/api/auth/signout').set(bearer(token)).expect(204)
    expect((await request(t.app).get('/api/auth/me').set(bearer(token))).status).toBe(401)
  })
})
