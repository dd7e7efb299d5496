/**
 * Saved configurations and share links: /api/configurations and /api/shared/:token.
 * Owner only: anyone else, whatever their role, gets 404 (so ids do not reveal what others saved).
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Entry } from '../../api/db'
import { RETIRED_NOTICE } from '../../api/services/configure'
import { bearer, demoEmail, signIn, signInAs, startTestApp, type TestApp } from './helpers'
import { readPdf } from './pdf-text'

let t: TestApp
let owner: string
let colleague: string
let librarian: string
let hook: Entry

const HOOK_PARAMS = { length: 14, undercut: 1 }

function binary(res: request.Response, done: (err: Error | null, body: Buffer) => void) {
  const chunks: Buffer[] = []
  res.on('data', (c: Buffer) => chunks.push(c))
  res.on('end', () => done(null, Buffer.concat(chunks)))
}

const as = (token: string) => ({
  get: (path: string) => request(t.app).get(path).set(bearer(token)),
  file: (path: string) => request(t.app).get(path).set(bearer(token)).buffer(true).parse(binary),
  post: (path: string, body?: object) => request(t.app).post(path).set(bearer(token)).send(body),
  delete: (path: string) => request(t.app).delete(path).set(bearer(token)),
})

async function save(body: Record<string, unknown> = {}, token = owner) {
  const res = await as(token).post('/api/configurations', { entryId: hook.id, name: 'Door hook, long arm', params: HOOK_PARAMS, ...body })
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body.configuration
}

async function auditActions(subjectId: number) {
  const events = await t.context.db.models.AuditEvent.findAll({ where: { subjectType: 'configuration', subjectId: String(subjectId) }, order: [['id', 'ASC']] })
  return events.map((e) => e.action)
}

beforeAll(async () => {
  t = await startTestApp()
  hook = (await t.context.db.models.Entry.findOne({ where: { name: 'Battery door snap hook, field node shell S1' } }))!
  owner = await signInAs(t.app, 'engineer')
  const other = await request(t.app).post('/api/auth/signup').send({ email: 'colleague@example.test', password: 'a colleague password', displayName: 'Oren Vasko' })
  colleague = other.body.token
  librarian = await signInAs(t.app, 'librarian')
})
afterAll(() => t.close())

describe('POST /api/configurations', () => {
  describe('as an engineer, with a valid configuration', () => {
    it('answers 201 with the complete parameters, the current revision and an audit event', async () => {
      const window = { kind: 'latch', matingForce: { max: 40 } }
      const c = await save({ window, tolerance: { thickness: 0.03 }, printer: { nozzle: 0.6 }, method: 'snap-fit-equations' })
      expect(c).toMatchObject({
        name: 'Door hook, long arm', entry: { id: hook.id, familyId: 'snap-hook', status: 'released' },
        params: { ...hook.defaultParams, ...HOOK_PARAMS }, method: 'snap-fit-equations', window,
        // a tolerance side left out is the common-practice default (±10 % modulus)
        tolerance: { thickness: 0.03, modulus: 0.1 }, printer: { nozzle: 0.6 },
        savedRevision: { id: hook.currentRevisionId, number: 1 }, currentRevision: { id: hook.currentRevisionId, number: 1 },
        revisionChanged: false, shareToken: null, shareUrl: null, readOnly: false, notices: [],
      })
      expect(await auditActions(c.id)).toEqual(['configuration.created'])
    })
  })

  describe('with bad fields', () => {
    it('answers 400 naming each', async () => {
      const res = await as(owner).post('/api/configurations', { entryId: hook.id, name: '  ', params: { length: 30 }, window: { kind: 'latch', matingForce: { max: -1 } } })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues.map((i: { field: string }) => i.field).sort()).toEqual(['name'])
      const second = await as(owner).post('/api/configurations', { entryId: hook.id, name: 'x', params: { length: 30 }, window: { kind: 'latch', matingForce: { max: -1 } } })
      expect(second.body.error.details.issues.map((i: { field: string }) => i.field).sort()).toEqual(['length', 'window.matingForce.max'])
      const third = await as(owner).post('/api/configurations', { entryId: 'hook', name: 'x' })
      expect(third.body.error.details.issues.map((i: { field: string }) => i.field)).toEqual(['entryId'])
    })
  })

  describe('for an unknown entry or one the engineer may not see', () => {
    it('answers 404 and saves nothing', async () => {
      const draft = (await t.context.db.models.Entry.findOne({ where: { status: 'draft' } }))!
      const before = await t.context.db.models.SavedConfiguration.count()
      expect((await as(owner).post('/api/configurations', { entryId: 999999, name: 'x' })).status).toBe(404)
      expect((await as(owner).post('/api/configurations', { entryId: draft.id, name: 'x' })).status).toBe(404)
      expect(await t.context.db.models.SavedConfiguration.count()).toBe(before)
    })
  })
})

describe('GET /api/configurations', () => {
  it('answers only the caller\u2019s own configurations', async () => {
    const mine = await save({ name: 'Mine to list' })
    const theirs = await save({ name: 'Theirs to list' }, colleague)
    const listed = (await as(owner).get('/api/configurations')).body.configurations.map((c: { id: number }) => c.id)
    expect(listed).toContain(mine.id)
    expect(listed).not.toContain(theirs.id)
    const theirList = (await as(colleague).get('/api/configurations')).body.configurations.map((c: { id: number }) => c.id)
    expect(theirList).toEqual([theirs.id])
  })
})

describe('GET /api/configurations/:id', () => {
  it('answers the owner, and 404 to another engineer and to a librarian', async () => {
    const c = await save()
    expect((await as(owner).get(`/api/configurations/${c.id}`)).body.configuration.id).toBe(c.id)
    expect((await as(colleague).get(`/api/configurations/${c.id}`)).status).toBe(404)
    expect((await as(librarian).get(`/api/configurations/${c.id}`)).status).toBe(404)
    expect((await as(colleague).get(`/api/configurations/${c.id}/stl`)).status).toBe(404)
    expect((await as(owner).get('/api/configurations/not-a-number')).status).toBe(404)
  })
})

describe('DELETE /api/configurations/:id', () => {
  it('lets only the owner delete, with an audit event', async () => {
    const c = await save({ name: 'To delete' })
    expect((await as(colleague).delete(`/api/configurations/${c.id}`)).status).toBe(404)
    expect((await as(owner).get(`/api/configurations/${c.id}`)).status).toBe(200)
    expect((await as(owner).delete(`/api/configurations/${c.id}`)).status).toBe(204)
    expect((await as(owner).get(`/api/configurations/${c.id}`)).status).toBe(404)
    expect(await auditActions(c.id)).toEqual(['configuration.created', 'configuration.deleted'])
  })
})

describe('POST /api/configurations/:id/share and GET /api/shared/:token', () => {
  let c: { id: number }
  let token: string
  beforeAll(async () => {
    c = await save({ name: 'Shared hook' })
    const res = await as(owner).post(`/api/configurations/${c.id}/share`)
    expect(res.status).toBe(200)
    token = res.body.shareToken
    expect(res.body.url).toBe(`/shared/${token}`)
  })

  it('gives a random 192-bit token, the same one when shared again, audited once', async () => {
    expect(token).toMatch(/^[A-Za-z0-9_-]{32}$/)
    const again = await as(owner).post(`/api/configurations/${c.id}/share`)
    expect(again.body.shareToken).toBe(token)
    expect((await save({ name: 'Another' }).then((o) => as(owner).post(`/api/configurations/${o.id}/share`))).body.shareToken).not.toBe(token)
    expect(await auditActions(c.id)).toEqual(['configuration.created', 'configuration.shared'])
    expect((await as(owner).get(`/api/configurations/${c.id}`)).body.configuration).toMatchObject({ shareToken: token, shareUrl: `/shared/${token}` })
  })

  it('refuses to share someone else\u2019s configuration', async () => {
    expect((await as(colleague).post(`/api/configurations/${c.id}/share`)).status).toBe(404)
  })

  it('opens read-only for any signed-in user, without the token or share controls', async () => {
    const res = await as(colleague).get(`/api/shared/${token}`)
    expect(res.status).toBe(200)
    expect(res.body.configuration).toMatchObject({ id: c.id, name: 'Shared hook', readOnly: true, shareToken: null, shareUrl: null, owner: { displayName: 'Tamsin Orel' } })
  })

  it('changes nothing through the link: there is no update or delete behind it', async () => {
    for (const method of ['delete', 'patch', 'put', 'post'] as const) {
      const res = await request(t.app)[method](`/api/shared/${token}`).set(bearer(colleague)).send({ name: 'renamed' })
      expect(res.status, method).toBe(404)
    }
    expect((await as(colleague).delete(`/api/configurations/${c.id}`)).status).toBe(404)
    expect((await as(owner).get(`/api/configurations/${c.id}`)).body.configuration.name).toBe('Shared hook')
  })

  it('offers the check and the downloads of what was saved', async () => {
    const stl = await as(colleague).file(`/api/shared/${token}/stl`)
    expect(stl.status).toBe(200)
    const direct = await as(owner).file(`/api/entries/${hook.id}/stl?params=${encodeURIComponent(JSON.stringify(HOOK_PARAMS))}`)
    expect(Buffer.compare(stl.body, direct.body)).toBe(0)
    const checked = await as(colleague).get(`/api/shared/${token}/check`)
    expect(checked.body.evaluation.params).toMatchObject(HOOK_PARAMS)
    expect((await as(colleague).get(`/api/shared/${token}/curve.csv`)).text).toMatch(/^Insertion travel \(mm\),Insertion force \(N\)/)
    expect((await as(colleague).get(`/api/shared/${token}/datasheet`)).body.datasheet.configuration).toEqual({ id: c.id, name: 'Shared hook' })
  })

  it('a configuration stored before wideBeam existed opens, by its link too, with the default "auto"', async () => {
    const old = await save({ name: 'Stored before wide beams' })
    const row = (await t.context.db.models.SavedConfiguration.findByPk(old.id))!
    const { wideBeam, ...before } = row.params as Record<string, unknown>
    expect(wideBeam).toBe('auto') // saved now, it is stored with the echo; an old record lacks it
    await row.update({ params: before as typeof row.params })
    const link = (await as(owner).post(`/api/configurations/${old.id}/share`)).body.shareToken
    for (const path of [`/api/configurations/${old.id}/check`, `/api/shared/${link}/check`]) {
      const checked = await as(path.startsWith('/api/shared') ? colleague : owner).get(path)
      expect(checked.status, path).toBe(200)
      expect(checked.body.evaluation.params.wideBeam, path).toBe('auto')
    }
    expect((await as(colleague).get(`/api/shared/${link}/datasheet`)).status).toBe(200)
  })

  it('answers 404 for a bad or unknown token', async () => {
    expect((await as(colleague).get('/api/shared/nope')).status).toBe(404)
    expect((await as(colleague).get(`/api/shared/${'A'.repeat(32)}`)).status).toBe(404)
    expect((await as(colleague).get(`/api/shared/${'A'.repeat(32)}/stl`)).status).toBe(404)
  })

  it('answers 404 once the owner withdraws the link', async () => {
    const other = await save({ name: 'Withdrawn' })
    const link = (await as(owner).post(`/api/configurations/${other.id}/share`)).body.shareToken
    expect((await as(colleague).get(`/api/shared/${link}`)).status).toBe(200)
    expect((await as(owner).delete(`/api/configurations/${other.id}/share`)).status).toBe(204)
    expect((await as(colleague).get(`/api/shared/${link}`)).status).toBe(404)
    expect(await auditActions(other.id)).toEqual(['configuration.created', 'configuration.shared', 'configuration.unshared'])
  })
})

describe('a saved configuration whose entry has moved on', () => {
  it('says so with both revision numbers and stays downloadable under the ranges it was saved with', async () => {
    const c = await save({ name: 'Before the narrowing', params: { length: 15 } })
    const { EntryRevision } = t.context.db.models
    const librarianUser = (await t.context.db.models.User.findOne({ where: { email: demoEmail('librarian') } }))!
    const first = (await EntryRevision.findByPk(hook.currentRevisionId!))!
    const ranges = { ...hook.ranges, length: [9, 13] as [number, number] }
    const second = await EntryRevision.create({
      entryId: hook.id, number: 2, params: first.params, ranges, method: first.method, curve: first.curve, metrics: first.metrics, warnings: [], createdById: librarianUser.id,
    })
    await hook.update({ currentRevisionId: second.id, ranges })
    try {
      const view = (await as(owner).get(`/api/configurations/${c.id}`)).body.configuration
      expect(view).toMatchObject({ revisionChanged: true, savedRevision: { number: 1 }, currentRevision: { number: 2 } })
      expect(view.notices.join(' ')).toMatch(/moved on to revision 2/)
      // length 15 is outside the new range 9–13 but inside revision 1's
      const stl = await as(owner).file(`/api/configurations/${c.id}/stl`)
      expect(stl.status).toBe(200)
      expect(stl.headers['flexshelf-notice']).toMatch(/moved on to revision 2/)
      expect((await as(owner).post(`/api/entries/${hook.id}/check`, { params: { length: 15 } })).status).toBe(400)
    } finally {
      await hook.update({ currentRevisionId: first.id, ranges: first.ranges })
    }
  })
})

describe('a saved configuration of an entry retired since', () => {
  it('stays downloadable from the configuration and its link, with the retired notice', async () => {
    const c = await save({ name: 'Made before retirement' })
    const token = (await as(owner).post(`/api/configurations/${c.id}/share`)).body.shareToken
    // retired directly through the model: the retire route belongs to curation
    await hook.update({ status: 'retired' })
    try {
      const view = (await as(owner).get(`/api/configurations/${c.id}`)).body.configuration
      expect(view.entry.status).toBe('retired')
      expect(view.notices).toContain(RETIRED_NOTICE)
      for (const path of [`/api/configurations/${c.id}`, `/api/shared/${token}`]) {
        const stl = await as(path.startsWith('/api/shared') ? colleague : owner).file(`${path}/stl`)
        expect(stl.status, path).toBe(200)
        expect(stl.headers['flexshelf-notice']).toBe(RETIRED_NOTICE)
        const csv = await as(owner).get(`/api/configurations/${c.id}/curve.csv`)
        expect(csv.headers['flexshelf-notice']).toBe(RETIRED_NOTICE)
      }
      const pdf = await as(owner).file(`/api/configurations/${c.id}/datasheet.pdf`)
      expect(pdf.status).toBe(200)
      expect(pdf.headers['flexshelf-notice']).toBe(RETIRED_NOTICE)
      const text = readPdf(pdf.body).text
      expect(text).toContain(RETIRED_NOTICE)
      expect(text).toContain('saved as "Made before retirement"')
      expect((await as(owner).get(`/api/configurations/${c.id}/datasheet`)).body.datasheet.notices).toEqual([RETIRED_NOTICE])
      expect((await as(owner).get(`/api/configurations/${c.id}/check`)).body.notices).toEqual([RETIRED_NOTICE])
    } finally {
      await hook.update({ status: 'released' })
    }
  })
})

describe('a shared configuration of an entry the viewer may not see', () => {
  it('answers 404 to them', async () => {
    const contributor = await signIn(t.app, demoEmail('contributor'))
    const draft = (await t.context.db.models.Entry.findOne({ where: { status: 'draft', name: 'Soft-touch switch, soil probe P3 (proposal)' } }))!
    const res = await as(contributor).post('/api/configurations', { entryId: draft.id, name: 'My draft switch', params: { postLength: 0 }, method: 'closed-form' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const token = (await as(contributor).post(`/api/configurations/${res.body.configuration.id}/share`)).body.shareToken
    expect((await as(colleague).get(`/api/shared/${token}`)).status).toBe(404)
    expect((await as(librarian).get(`/api/shared/${token}`)).status).toBe(200)
  })
})

describe('a configuration saved before the physical bounds (issue 11)', () => {
  // the hostile printer of the issue: saved and shared, its link was a kill switch for anyone opening it
  const HOSTILE = { nozzle: 1e-300, layer: 1e-300 }

  it('cannot be saved any more: 400 naming the printer fields', async () => {
    const res = await as(owner).post('/api/configurations', { entryId: hook.id, name: 'Hostile printer', params: HOOK_PARAMS, printer: HOSTILE })
    expect(res.status).toBe(400)
    expect(res.body.error.details.issues.map((i: { field: string }) => i.field).sort()).toEqual(['printer.layer', 'printer.nozzle'])
  })

  it('opens with a clear message from its owner, the list and its link, and its check and downloads answer 400 naming the field', async () => {
    const c = await save({ name: 'Saved with an old printer' })
    // written as an older server stored it, before the bounds
    await t.context.db.models.SavedConfiguration.update({ printer: HOSTILE }, { where: { id: c.id } })
    const token = (await as(owner).post(`/api/configurations/${c.id}/share`)).body.shareToken
    const own = await as(owner).get(`/api/configurations/${c.id}`)
    const shared = await as(colleague).get(`/api/shared/${token}`)
    for (const res of [own, shared]) {
      expect(res.status).toBe(200)
      expect(res.body.configuration.problems.map((p: { field: string }) => p.field).sort()).toEqual(['printer.layer', 'printer.nozzle'])
      expect(res.body.configuration.notices.join(' ')).toMatch(/saved with values Flexshelf no longer accepts; correct them in the configurator and save it again: printer.nozzle must be from 0.1 to 2 mm/)
    }
    const list = await as(owner).get('/api/configurations')
    expect(list.status).toBe(200)
    for (const path of [`/api/configurations/${c.id}/check`, `/api/shared/${token}/check`, `/api/shared/${token}/stl`, `/api/configurations/${c.id}/datasheet.pdf`]) {
      const res = await as(path.startsWith('/api/shared') ? colleague : owner).get(path)
      expect(res.status, path).toBe(400)
      expect(res.body.error.message).toMatch(/^this saved configuration holds values that are no longer accepted: /)
      expect(res.body.error.details.issues.map((i: { field: string }) => i.field)).toContain('printer.nozzle')
    }
  })
})
