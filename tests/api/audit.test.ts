/** GET /api/audit with filters, and /api/audit/csv (formula cells neutralised, OWASP "CSV Injection"). */
import Papa from 'papaparse'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
let admin: string
beforeAll(async () => {
  t = await startTestApp()
  admin = await signInAs(t.app, 'admin')
  await request(t.app).post('/api/auth/signup').send({ email: 'first@example.test', password: 'russet harbour violin 3', displayName: '=HYPERLINK("http://x.test","y")' }).expect(201)
  await request(t.app).post('/api/auth/signup').send({ email: 'second@example.test', password: 'russet harbour violin 4', displayName: 'Second Person' }).expect(201)
  // one event dated last year, for the date filter
  await t.context.db.models.AuditEvent.create({ actorId: null, action: 'user.role_changed', subjectType: 'user', subjectId: '1', details: { from: 'engineer', to: 'contributor' }, at: new Date('2025-03-10T12:00:00Z') })
})
afterAll(() => t.close())

describe('GET /api/audit', () => {
  it('filters by person (as actor or subject), action and dates, and lists the actions', async () => {
    const users = (await request(t.app).get('/api/users').set(bearer(admin))).body.users as Array<{ id: number; email: string }>
    const second = users.find((u) => u.email === 'second@example.test')!
    const byPerson = await request(t.app).get(`/api/audit?person=${second.id}`).set(bearer(admin))
    expect(byPerson.status).toBe(200)
    expect(byPerson.body.events.map((e: { action: string }) => e.action)).toEqual(['user.signup'])
    expect(byPerson.body.actions).toEqual(['user.role_changed', 'user.signup'])
    const signups = await request(t.app).get('/api/audit?action=user.signup').set(bearer(admin))
    expect(signups.body.events).toHaveLength(2)
    const lastYear = await request(t.app).get('/api/audit?from=2025-03-10&to=2025-03-10').set(bearer(admin))
    expect(lastYear.body.events.map((e: { action: string }) => e.action)).toEqual(['user.role_changed'])
    const none = await request(t.app).get('/api/audit?from=2025-03-11&to=2025-12-31').set(bearer(admin))
    expect(none.body.events).toEqual([])
  })

  it('answers 400 naming the filter for bad values', async () => {
    const res = await request(t.app).get('/api/audit?from=10/03/2025&person=abc&colour=red').set(bearer(admin))
    expect(res.status).toBe(400)
    const fields = res.body.error.details.issues.map((i: { field: string }) => i.field).sort()
    expect(fields).toEqual(['colour', 'from', 'person'])
    const reversed = await request(t.app).get('/api/audit?from=2025-05-01&to=2025-04-01').set(bearer(admin))
    expect(reversed.body.error.details.issues).toEqual([{ field: 'to', message: 'to must not be before from' }])
  })
})

describe('GET /api/audit/csv', () => {
  it('sends the filtered events as an attachment with formula cells neutralised', async () => {
    const res = await request(t.app).get('/api/audit/csv?action=user.signup').set(bearer(admin))
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toContain('text/csv')
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="flexshelf-audit-\d{4}-\d{2}-\d{2}\.csv"$/)
    const rows = Papa.parse<string[]>(res.text.trim()).data
    expect(rows[0]).toEqual(['at', 'actor', 'actor id', 'action', 'subject type', 'subject id', 'details'])
    expect(rows.slice(1).map((r) => r[3])).toEqual(['user.signup', 'user.signup'])
    const actors = rows.slice(1).map((r) => r[1])
    expect(actors).toContain(`'=HYPERLINK("http://x.test","y")`)
    expect(rows.flat().some((cell) => /^[=+\-@]/.test(cell))).toBe(false)
  })
})
