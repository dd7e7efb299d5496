/**
 * Who may call what: for every API route, the status each role must get. A route added
 * to the app without a row here fails the walk at the bottom.
 */
import { mkdirSync, writeFileSync } from 'node:fs'
import { join as joinPath } from 'node:path'
import type { Express } from 'express'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { families } from '../../catalog'
import { ROLES, type Role } from '../../api/roles'
import { bearer, demoEmail, signIn, signInAs, startTestApp, type TestApp } from './helpers'

type Caller = 'anonymous' | Role
const CALLERS: Caller[] = ['anonymous', ...ROLES]

interface Row {
  /** METHOD and the route's path as registered (parameters as :name). */
  route: string
  /** What this row checks, when a route has more than one. */
  case?: string
  path: () => string
  body?: () => unknown
  /** A token used only for this request (sign-out revokes it). */
  freshToken?: boolean
  /** A multipart body instead of JSON: text fields and files (field → [bytes, file name]). */
  multipart?: () => { fields: Record<string, string>; files: Record<string, [Buffer, string]> }
  expected: Record<Caller, number>
}

const statuses = (anonymous: number, engineer: number, contributor: number, librarian: number, admin: number) =>
  ({ anonymous, engineer, contributor, librarian, admin })

let t: TestApp
const tokens = {} as Record<Role, string>
const fixture = { targetUserId: 0, draftEntryId: 0, releasedEntryId: 0, adminSearchId: '' }
const SEARCH_WINDOW = { kind: 'spring', stiffness: { min: 0.1, max: 1 }, limit: 3 }
// configure: a released snap-hook entry (a fast model) and the admin's saved configurations of it
const configure = { entryId: 0, ownId: 0, deleteId: 0, unshareId: 0, shareToken: '' }
const CONFIGURE_QUERY = `params=${encodeURIComponent(JSON.stringify({ length: 12 }))}`
let accounts = 0
// curation: one record per state-changing route, so each row starts from the state it needs
const curation = {
  submitDraftId: 0, editDraftId: 0, releaseId: 0, rejectId: 0, requestChangesId: 0, retireId: 0,
  shelfEntryId: 0, shelfRevisionId: 0, acceptReportId: 0, rejectReportId: 0, acceptedReportId: 0,
}
const GOOD_CSV = Buffer.from('displacement,force\n0,0\n0.5,0.8\n1,1.5\n1.5,2.1\n2,2.6\n2.5,2.9\n')
const PNG_BYTES = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d])

const SIGNIN_ACCOUNT = { email: 'table.signin@example.test', password: 'table password 1', displayName: 'Sela Marr' }

const ROWS: Row[] = [
  { route: 'GET /api/health', path: () => '/api/health', expected: statuses(200, 200, 200, 200, 200) },
  { route: 'GET /api/ready', path: () => '/api/ready', expected: statuses(200, 200, 200, 200, 200) },
  {
    route: 'POST /api/auth/signup', path: () => '/api/auth/signup',
    body: () => ({ email: `table.account.${++accounts}@example.test`, password: 'a good long password', displayName: 'Table Account' }),
    expected: statuses(201, 201, 201, 201, 201),
  },
  {
    route: 'POST /api/auth/signin', path: () => '/api/auth/signin',
    body: () => ({ email: SIGNIN_ACCOUNT.email, password: SIGNIN_ACCOUNT.password }),
    expected: statuses(200, 200, 200, 200, 200),
  },
  { route: 'POST /api/auth/signout', path: () => '/api/auth/signout', freshToken: true, expected: statuses(401, 204, 204, 204, 204) },
  { route: 'GET /api/auth/me', path: () => '/api/auth/me', expected: statuses(401, 200, 200, 200, 200) },
  { route: 'GET /api/auth/options', path: () => '/api/auth/options', expected: statuses(200, 200, 200, 200, 200) },
  {
    // a wrong current password: the gate is passed (400), nothing changes
    route: 'POST /api/auth/password', path: () => '/api/auth/password', body: () => ({ currentPassword: 'not the password', newPassword: 'walnut glacier tinder 5' }),
    expected: statuses(401, 400, 400, 400, 400),
  },
  {
    route: 'POST /api/auth/password-reset', path: () => '/api/auth/password-reset', body: () => ({ email: 'no.account@example.test' }),
    expected: statuses(202, 202, 202, 202, 202),
  },
  {
    route: 'POST /api/auth/password-reset/confirm', path: () => '/api/auth/password-reset/confirm', body: () => ({ token: 'not-a-reset-token', newPassword: 'walnut glacier tinder 5' }),
    expected: statuses(400, 400, 400, 400, 400),
  },
  { route: 'GET /api/users', path: () => '/api/users', expected: statuses(401, 403, 403, 403, 200) },
  {
    route: 'PATCH /api/users/:id/role', path: () => `/api/users/${fixture.targetUserId}/role`, body: () => ({ role: 'contributor' }),
    expected: statuses(401, 403, 403, 403, 200),
  },
  { route: 'POST /api/users/:id/unlock', path: () => `/api/users/${fixture.targetUserId}/unlock`, expected: statuses(401, 403, 403, 403, 200) },
  { route: 'GET /api/families', path: () => '/api/families', expected: statuses(401, 200, 200, 200, 200) },
  { route: 'GET /api/families/:id', path: () => `/api/families/${families[0].id}`, expected: statuses(401, 200, 200, 200, 200) },
  {
    route: 'POST /api/families/:id/evaluate', path: () => `/api/families/${families[0].id}/evaluate`, body: () => ({ params: {} }),
    expected: statuses(401, 200, 200, 200, 200),
  },
  { route: 'GET /api/materials', path: () => '/api/materials', expected: statuses(401, 200, 200, 200, 200) },
  { route: 'GET /api/entries', path: () => '/api/entries', expected: statuses(401, 200, 200, 200, 200) },
  {
    route: 'GET /api/entries/:id', case: 'a released entry', path: () => `/api/entries/${fixture.releasedEntryId}`,
    expected: statuses(401, 200, 200, 200, 200),
  },
  {
    route: 'GET /api/entries/:id', case: "the contributor's draft", path: () => `/api/entries/${fixture.draftEntryId}`,
    expected: statuses(401, 404, 200, 200, 200),
  },
  { route: 'GET /api/audit', path: () => '/api/audit', expected: statuses(401, 403, 403, 403, 200) },
  { route: 'GET /api/audit/csv', path: () => '/api/audit/csv', expected: statuses(401, 403, 403, 403, 200) },
  // single sign-on is off in this app: the flow's routes say so (404)
  { route: 'GET /api/auth/oidc/start', path: () => '/api/auth/oidc/start', expected: statuses(404, 404, 404, 404, 404) },
  { route: 'GET /api/auth/oidc/callback', path: () => '/api/auth/oidc/callback?code=x&state=y', expected: statuses(404, 404, 404, 404, 404) },
  { route: 'POST /api/auth/oidc/session', path: () => '/api/auth/oidc/session', expected: statuses(404, 404, 404, 404, 404) },
  // curation (docs/api.md, "Curation"): a refused caller changes nothing, so the first
  // allowed caller moves the record on and higher roles meet its new status (409)
  {
    route: 'POST /api/entries', path: () => '/api/entries', body: () => ({ family: 'leaf-hinge', name: 'Access table proposal' }),
    expected: statuses(401, 403, 201, 201, 201),
  },
  {
    route: 'PATCH /api/entries/:id', case: 'the contributor\u2019s draft (owner only)', path: () => `/api/entries/${curation.editDraftId}`, body: () => ({ summary: 'edited' }),
    expected: statuses(401, 403, 200, 403, 403),
  },
  {
    route: 'POST /api/entries/:id/proposals', path: () => `/api/entries/${curation.shelfEntryId}/proposals`, body: () => ({ notes: 'a change' }),
    expected: statuses(401, 403, 201, 201, 201),
  },
  {
    route: 'POST /api/entries/:id/comments', path: () => `/api/entries/${curation.shelfEntryId}/comments`, body: () => ({ text: 'looks right' }),
    expected: statuses(401, 403, 201, 201, 201),
  },
  { route: 'POST /api/entries/:id/submit', case: 'owner only', path: () => `/api/entries/${curation.submitDraftId}/submit`, expected: statuses(401, 403, 200, 403, 403) },
  { route: 'POST /api/entries/:id/release', path: () => `/api/entries/${curation.releaseId}/release`, expected: statuses(401, 403, 403, 200, 409) },
  { route: 'POST /api/entries/:id/reject', path: () => `/api/entries/${curation.rejectId}/reject`, body: () => ({ reason: 'duplicate' }), expected: statuses(401, 403, 403, 200, 409) },
  {
    route: 'POST /api/entries/:id/request-changes', path: () => `/api/entries/${curation.requestChangesId}/request-changes`, body: () => ({ comment: 'narrow the span' }),
    expected: statuses(401, 403, 403, 200, 409),
  },
  { route: 'POST /api/entries/:id/retire', path: () => `/api/entries/${curation.retireId}/retire`, expected: statuses(401, 403, 403, 200, 409) },
  { route: 'GET /api/entries/:id/diff', path: () => `/api/entries/${curation.shelfEntryId}/diff`, expected: statuses(401, 200, 200, 200, 200) },
  {
    route: 'GET /api/entries/:id/revisions/compare', path: () => `/api/entries/${curation.shelfEntryId}/revisions/compare?a=${curation.shelfRevisionId}&b=${curation.shelfRevisionId}`,
    expected: statuses(401, 200, 200, 200, 200),
  },
  { route: 'GET /api/review-queue', path: () => '/api/review-queue', expected: statuses(401, 403, 403, 200, 200) },
  {
    route: 'POST /api/entries/:id/reports', path: () => `/api/entries/${curation.shelfEntryId}/reports`,
    multipart: () => ({ fields: { printer: 'Bench printer 1', material: 'PETG' }, files: { file: [GOOD_CSV, 'run.csv'] } }),
    expected: statuses(401, 403, 201, 201, 201),
  },
  { route: 'GET /api/entries/:id/calibration', path: () => `/api/entries/${curation.shelfEntryId}/calibration`, expected: statuses(401, 200, 200, 200, 200) },
  { route: 'POST /api/reports/:id/accept', path: () => `/api/reports/${curation.acceptReportId}/accept`, expected: statuses(401, 403, 403, 200, 409) },
  { route: 'POST /api/reports/:id/reject', path: () => `/api/reports/${curation.rejectReportId}/reject`, body: () => ({ note: 'wrong fixture' }), expected: statuses(401, 403, 403, 200, 409) },
  {
    route: 'POST /api/reports/:id/adopt-modulus', case: 'the second adoption of one report is a duplicate',
    path: () => `/api/reports/${curation.acceptedReportId}/adopt-modulus`, expected: statuses(401, 403, 403, 201, 409),
  },
  { route: 'GET /api/reports/:id/curve', path: () => `/api/reports/${curation.acceptedReportId}/curve`, expected: statuses(401, 200, 200, 200, 200) },
  { route: 'GET /api/reports/:id/file', path: () => `/api/reports/${curation.acceptedReportId}/file`, expected: statuses(401, 200, 200, 200, 200) },
  { route: 'GET /api/reports/:id/photo', path: () => `/api/reports/${curation.acceptedReportId}/photo`, expected: statuses(401, 200, 200, 200, 200) },
  { route: 'GET /api/outbox', path: () => '/api/outbox', expected: statuses(401, 403, 403, 403, 200) },
  // search: any signed-in user; a search job is its owner's alone (others get 404)
  { route: 'GET /api/shelf', path: () => '/api/shelf', expected: statuses(401, 200, 200, 200, 200) },
  { route: 'POST /api/search', path: () => '/api/search', body: () => SEARCH_WINDOW, expected: statuses(401, 200, 200, 200, 200) },
  { route: 'POST /api/searches', path: () => '/api/searches', body: () => SEARCH_WINDOW, expected: statuses(401, 202, 202, 202, 202) },
  { route: 'GET /api/searches/:id', path: () => `/api/searches/${fixture.adminSearchId}`, expected: statuses(401, 404, 404, 404, 200) },
  { route: 'GET /api/searches/:id/events', path: () => `/api/searches/${fixture.adminSearchId}/events`, expected: statuses(401, 404, 404, 404, 200) },
  { route: 'DELETE /api/searches/:id', path: () => `/api/searches/${fixture.adminSearchId}`, expected: statuses(401, 404, 404, 404, 204) },
  // configure (docs/api.md, "Configure"): any signed-in user on a visible entry
  { route: 'POST /api/entries/:id/check', path: () => `/api/entries/${configure.entryId}/check`, body: () => ({ params: { length: 12 } }), expected: statuses(401, 200, 200, 200, 200) },
  { route: 'GET /api/entries/:id/stl', path: () => `/api/entries/${configure.entryId}/stl?${CONFIGURE_QUERY}`, expected: statuses(401, 200, 200, 200, 200) },
  ...['3mf', 'dxf', 'svg'].map((file): Row => ({
    route: `GET /api/entries/:id/${file}`, path: () => `/api/entries/${configure.entryId}/${file}?${CONFIGURE_QUERY}`, expected: statuses(401, 200, 200, 200, 200),
  })),
  // comparing results: any signed-in user, over entries they can see
  ...['', '/csv', '/pdf'].map((file): Row => ({
    route: `GET /api/compare${file}`, path: () => `/api/compare${file}?items=${encodeURIComponent(JSON.stringify([{ entryId: configure.entryId, params: { length: 12 } }]))}`, expected: statuses(401, 200, 200, 200, 200),
  })),
  { route: 'GET /api/entries/:id/curve.csv', path: () => `/api/entries/${configure.entryId}/curve.csv?${CONFIGURE_QUERY}`, expected: statuses(401, 200, 200, 200, 200) },
  { route: 'GET /api/entries/:id/datasheet', path: () => `/api/entries/${configure.entryId}/datasheet?${CONFIGURE_QUERY}`, expected: statuses(401, 200, 200, 200, 200) },
  { route: 'GET /api/entries/:id/datasheet.pdf', path: () => `/api/entries/${configure.entryId}/datasheet.pdf?${CONFIGURE_QUERY}`, expected: statuses(401, 200, 200, 200, 200) },
  // saved configurations: each caller lists and saves their own; someone else's answers 404
  { route: 'GET /api/configurations', path: () => '/api/configurations', expected: statuses(401, 200, 200, 200, 200) },
  {
    route: 'POST /api/configurations', path: () => '/api/configurations', body: () => ({ entryId: configure.entryId, name: 'Access table save', params: { length: 12 } }),
    expected: statuses(401, 201, 201, 201, 201),
  },
  { route: 'GET /api/configurations/:id', case: "the admin's (owner only)", path: () => `/api/configurations/${configure.ownId}`, expected: statuses(401, 404, 404, 404, 200) },
  { route: 'DELETE /api/configurations/:id', case: "the admin's (owner only)", path: () => `/api/configurations/${configure.deleteId}`, expected: statuses(401, 404, 404, 404, 204) },
  { route: 'POST /api/configurations/:id/share', case: "the admin's (owner only)", path: () => `/api/configurations/${configure.ownId}/share`, expected: statuses(401, 404, 404, 404, 200) },
  { route: 'DELETE /api/configurations/:id/share', case: "the admin's (owner only)", path: () => `/api/configurations/${configure.unshareId}/share`, expected: statuses(401, 404, 404, 404, 204) },
  ...['check', 'stl', '3mf', 'dxf', 'svg', 'curve.csv', 'datasheet', 'datasheet.pdf'].map((file): Row => ({
    route: `GET /api/configurations/:id/${file}`, case: "the admin's (owner only)", path: () => `/api/configurations/${configure.ownId}/${file}`, expected: statuses(401, 404, 404, 404, 200),
  })),
  // a share link: any signed-in user, read-only
  { route: 'GET /api/shared/:token', path: () => `/api/shared/${configure.shareToken}`, expected: statuses(401, 200, 200, 200, 200) },
  ...['check', 'stl', '3mf', 'dxf', 'svg', 'curve.csv', 'datasheet', 'datasheet.pdf'].map((file): Row => ({
    route: `GET /api/shared/:token/${file}`, path: () => `/api/shared/${configure.shareToken}/${file}`, expected: statuses(401, 200, 200, 200, 200),
  })),
]

beforeAll(async () => {
  t = await startTestApp()
  const { Entry, User } = t.context.db.models
  await request(t.app).post('/api/auth/signup').send(SIGNIN_ACCOUNT).expect(201)
  const target = await request(t.app).post('/api/auth/signup').send({ email: 'table.target@example.test', password: 'target password 1', displayName: 'Tor Vale' }).expect(201)
  fixture.targetUserId = target.body.user.id
  const contributor = (await User.findOne({ where: { email: demoEmail('contributor') } }))!
  const librarian = (await User.findOne({ where: { email: demoEmail('librarian') } }))!
  const entry = (name: string, status: 'draft' | 'released', ownerId: number) =>
    Entry.create({ familyId: 'bistable-beam', name, summary: '', tags: [], status, defaultParams: {}, ranges: {}, materials: [], ownerId, currentRevisionId: null })
  fixture.draftEntryId = (await entry('Access table draft', 'draft', contributor.id)).id
  fixture.releasedEntryId = (await entry('Access table release', 'released', librarian.id)).id
  await curationFixtures(contributor.id, librarian.id)
  for (const role of ROLES) tokens[role] = await signInAs(t.app, role)
  fixture.adminSearchId = (await request(t.app).post('/api/searches').set(bearer(tokens.admin)).send(SEARCH_WINDOW).expect(202)).body.id
  await configureFixtures()
})

async function configureFixtures() {
  const hook = (await t.context.db.models.Entry.findOne({ where: { familyId: 'snap-hook', status: 'released' }, order: [['id', 'ASC']] }))!
  configure.entryId = hook.id
  const save = async (name: string) =>
    (await request(t.app).post('/api/configurations').set(bearer(tokens.admin)).send({ entryId: hook.id, name, params: { length: 12 } }).expect(201)).body.configuration.id as number
  configure.ownId = await save('Access table own')
  configure.deleteId = await save('Access table to delete')
  configure.unshareId = await save('Access table to unshare')
  await request(t.app).post(`/api/configurations/${configure.unshareId}/share`).set(bearer(tokens.admin)).expect(200)
  const shared = await save('Access table shared')
  configure.shareToken = (await request(t.app).post(`/api/configurations/${shared}/share`).set(bearer(tokens.admin)).expect(200)).body.shareToken
}
afterAll(() => t.close())

async function curationFixtures(contributorId: number, librarianId: number) {
  const { Entry, EntryRevision, TestReport } = t.context.db.models
  const entry = async (name: string, status: 'draft' | 'in_review' | 'released', ownerId: number) =>
    (await Entry.create({ familyId: 'bistable-beam', name, summary: '', tags: [], status, defaultParams: {}, ranges: {}, materials: [], ownerId, currentRevisionId: null })).id
  curation.submitDraftId = await entry('Access table draft to submit', 'draft', contributorId)
  curation.editDraftId = await entry('Access table draft to edit', 'draft', contributorId)
  curation.releaseId = await entry('Access table to release', 'in_review', contributorId)
  curation.rejectId = await entry('Access table to reject', 'in_review', contributorId)
  curation.requestChangesId = await entry('Access table to send back', 'in_review', contributorId)
  curation.retireId = await entry('Access table to retire', 'released', librarianId)

  // a seeded released bistable entry with its first revision carries the report rows
  const shelf = (await Entry.findOne({ where: { familyId: 'bistable-beam', status: 'released' }, order: [['id', 'ASC']] }))!
  const revision = (await EntryRevision.findByPk(shelf.currentRevisionId!))!
  curation.shelfEntryId = shelf.id
  curation.shelfRevisionId = revision.id
  const measured = { displacement: revision.curve.displacement.slice(0, 30), force: revision.curve.force.slice(0, 30).map((f) => 0.9 * f) }
  const report = async (status: 'submitted' | 'accepted', filePath: string, photoPath: string | null) => (await TestReport.create({
    entryId: shelf.id, revisionId: revision.id, uploaderId: contributorId, reviewerId: null, filePath, originalName: 'stand.csv', photoPath,
    printer: 'Bench printer 1', material: 'PETG', lot: 'L-1', orientation: 'flat', testSpeed: 10, notes: '', status, measuredCurve: measured,
  })).id
  curation.acceptReportId = await report('submitted', 'reports/access-a.csv', null)
  curation.rejectReportId = await report('submitted', 'reports/access-b.csv', null)
  curation.acceptedReportId = await report('accepted', 'reports/access-c.csv', 'photos/access-c.png')
  const uploads = t.context.config.uploadsDir
  mkdirSync(joinPath(uploads, 'reports'), { recursive: true })
  mkdirSync(joinPath(uploads, 'photos'), { recursive: true })
  writeFileSync(joinPath(uploads, 'reports/access-c.csv'), GOOD_CSV)
  writeFileSync(joinPath(uploads, 'photos/access-c.png'), PNG_BYTES)
}

async function call(row: Row, caller: Caller) {
  const [method] = row.route.split(' ')
  let req = request(t.app)[method.toLowerCase() as 'get' | 'post' | 'patch' | 'delete'](row.path())
  if (caller !== 'anonymous') {
    const token = row.freshToken ? await signIn(t.app, demoEmail(caller)) : tokens[caller]
    req = req.set(bearer(token))
  }
  if (row.multipart) {
    const { fields, files } = row.multipart()
    for (const [name, value] of Object.entries(fields)) req = req.field(name, value)
    for (const [name, [bytes, filename]] of Object.entries(files)) req = req.attach(name, bytes, filename)
    return req
  }
  return row.body ? req.send(row.body() as object) : req
}

for (const row of ROWS) {
  describe(row.case ? `${row.route} (${row.case})` : row.route, () => {
    for (const caller of CALLERS) {
      const expected = row.expected[caller]
      describe(caller === 'anonymous' ? 'anonymously' : `as ${caller === 'admin' || caller === 'engineer' ? 'an' : 'a'} ${caller}`, () => {
        it(`answers ${expected}`, async () => {
          const res = await call(row, caller)
          expect(res.status, JSON.stringify(res.body)).toBe(expected)
          if (expected >= 400) expect(Object.keys(res.body.error).sort()).toEqual(['code', 'details', 'message'])
        })
      })
    }
  })
}

interface RegisteredRoute {
  route: string
  minimumRoles: Array<Role | 'public'>
}

interface StackLayer {
  rawPath?: unknown
  route?: { path: string; methods: Record<string, boolean>; stack: Array<{ handle: { minimumRole?: Role | 'public' } }> }
  handle?: { stack?: StackLayer[] }
}

/** Every route of the app under /api, read from Express 5's router stack. */
function registeredApiRoutes(app: Express): RegisteredRoute[] {
  const found: RegisteredRoute[] = []
  const join = (...parts: string[]) => parts.join('').replace(/\/{2,}/g, '/').replace(/(.)\/$/, '$1')
  const walk = (stack: StackLayer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const method of Object.keys(layer.route.methods)) {
          if (method === '_all') continue
          const minimumRoles = layer.route.stack.map((l) => l.handle.minimumRole).filter((r): r is Role | 'public' => r !== undefined)
          found.push({ route: `${method.toUpperCase()} ${join(prefix, layer.route.path)}`, minimumRoles })
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, join(prefix, typeof layer.rawPath === 'string' ? layer.rawPath : ''))
      }
    }
  }
  walk((app as unknown as { router: { stack: StackLayer[] } }).router.stack, '')
  return found.filter((r) => r.route.split(' ')[1].startsWith('/api'))
}

/** The lowest caller a row lets through (not 401 or 403). */
function lowestAllowed(row: Row): Role | 'public' {
  const caller = CALLERS.find((c) => ![401, 403].includes(row.expected[c]))!
  return caller === 'anonymous' ? 'public' : caller
}

describe('the registered API routes', () => {
  it('each have a row in the access table', () => {
    const registered = registeredApiRoutes(t.app).map((r) => r.route)
    expect(registered.length).toBeGreaterThanOrEqual(14)
    const inTable = new Set(ROWS.map((r) => r.route))
    expect(registered.filter((r) => !inTable.has(r)), 'routes without a row').toEqual([])
  })

  it('are all in the app (no row for a route that does not exist)', () => {
    const registered = new Set(registeredApiRoutes(t.app).map((r) => r.route))
    expect(ROWS.map((r) => r.route).filter((r) => !registered.has(r))).toEqual([])
  })

  it('each declare exactly one minimum role, the one the table expects', () => {
    for (const route of registeredApiRoutes(t.app)) {
      expect(route.minimumRoles, route.route).toHaveLength(1)
      for (const row of ROWS.filter((r) => r.route === route.route)) expect(route.minimumRoles[0], route.route).toBe(lowestAllowed(row))
    }
  })
})
