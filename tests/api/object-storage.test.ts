/**
 * Report files and photos in an S3-compatible bucket (FLEXSHELF_S3_*), here the local fake
 * that `npm run dev:s3` runs: an upload lands in the bucket and nowhere on disk, the bucket's
 * bytes are checked with a separate S3 client, downloads come back through the same checks
 * as from the data folder (formula cells neutralised, fixed types, sign-in required), and a refused upload leaves the bucket as it was.
 */
import { mkdtempSync, readdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { ListObjectsV2Command, GetObjectCommand, S3Client } from '@aws-sdk/client-s3'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { loadConfig } from '../../api/config'
import { startFakeS3, type FakeS3 } from '../../scripts/support/fake-s3'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

let s3: FakeS3
let s3Dir: string
let t: TestApp
let client: S3Client
let entryId: number
let engineer: string // a contributor: the role that uploads reports

const PNG = Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.alloc(4096, 7)])
// a cell a spreadsheet would run as a formula (OWASP "CSV Injection": leading = + - @)
const STAND_CSV = Buffer.from('note,displacement,force\n=HYPERLINK("x"),0,0\nok,0.2,0.4\nok,0.4,0.7\nok,0.6,0.9\nok,0.8,1.0\nok,1.0,1.05\n')

async function bucketKeys(): Promise<string[]> {
  const listed = await client.send(new ListObjectsV2Command({ Bucket: s3.bucket }))
  return (listed.Contents ?? []).map((o) => o.Key!).sort()
}

beforeAll(async () => {
  s3Dir = mkdtempSync(join(tmpdir(), 'flexshelf-s3-'))
  s3 = await startFakeS3({ directory: s3Dir, bucket: 'flexshelf-reports-test' })
  const settings = loadConfig({ FLEXSHELF_DATA: s3Dir, ...s3.env }, { jwtSecret: 'x'.repeat(40) }).s3
  t = await startTestApp({ config: { s3: settings } })
  client = new S3Client({ region: 'us-east-1', endpoint: s3.endpoint, forcePathStyle: true, credentials: { accessKeyId: s3.env.FLEXSHELF_S3_ACCESS_KEY_ID, secretAccessKey: s3.env.FLEXSHELF_S3_SECRET_ACCESS_KEY } })
  engineer = await signInAs(t.app, 'contributor')
  const entry = (await t.context.db.models.Entry.findOne({ where: { familyId: 'bistable-beam', status: 'released' }, order: [['id', 'ASC']] }))!
  entryId = entry.id
})
afterAll(async () => {
  client?.destroy()
  await t?.close()
  await s3?.stop()
  rmSync(s3Dir, { recursive: true, force: true })
})

const upload = (file: Buffer, photo?: Buffer) => {
  let req = request(t.app).post(`/api/entries/${entryId}/reports`).set(bearer(engineer))
  for (const [k, v] of Object.entries({ printer: 'Bench printer 2', material: 'PETG', testSpeed: '10', displacementColumn: 'displacement', forceColumn: 'force' })) req = req.field(k, v)
  req = req.attach('file', file, 'stand-run.csv')
  if (photo) req = req.attach('photo', photo, 'part.png')
  return req
}

describe('with FLEXSHELF_S3_BUCKET set', () => {
  it('reads the settings: path style for a custom endpoint, credentials in pairs', () => {
    expect(t.context.config.s3).toMatchObject({ bucket: 'flexshelf-reports-test', endpoint: s3.endpoint, forcePathStyle: true })
    expect(() => loadConfig({ FLEXSHELF_DATA: s3Dir, FLEXSHELF_S3_ENDPOINT: s3.endpoint })).toThrow(/FLEXSHELF_S3_BUCKET is not/)
    expect(() => loadConfig({ FLEXSHELF_DATA: s3Dir, FLEXSHELF_S3_BUCKET: 'Bad_Bucket' })).toThrow(/FLEXSHELF_S3_BUCKET must be a bucket name/)
    expect(() => loadConfig({ FLEXSHELF_DATA: s3Dir, FLEXSHELF_S3_BUCKET: 'ok-bucket', FLEXSHELF_S3_ACCESS_KEY_ID: 'a' })).toThrow(/go together/)
  })

  it('stores an upload in the bucket, not on disk, and serves it back with the same checks', async () => {
    const res = await upload(STAND_CSV, PNG)
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const reportId = res.body.report.id as number
    const keys = await bucketKeys()
    expect(keys).toHaveLength(2)
    expect(keys.filter((k) => /^reports\/[0-9a-f]{32}\.csv$/.test(k))).toHaveLength(1)
    expect(keys.filter((k) => /^photos\/[0-9a-f]{32}\.png$/.test(k))).toHaveLength(1)
    expect(readdirSync(t.dataDir)).not.toContain('uploads')

    // the bucket holds the upload's exact bytes (read with a client of its own)
    const stored = await client.send(new GetObjectCommand({ Bucket: s3.bucket, Key: keys.find((k) => k.endsWith('.png')) }))
    expect(Buffer.from(await stored.Body!.transformToByteArray()).equals(PNG)).toBe(true)

    const photo = await request(t.app).get(`/api/reports/${reportId}/photo`).set(bearer(engineer)).buffer(true).parse((r, cb) => {
      const parts: Buffer[] = []
      r.on('data', (c: Buffer) => parts.push(c))
      r.on('end', () => cb(null, Buffer.concat(parts)))
    })
    expect(photo.status).toBe(200)
    expect(photo.headers['content-type']).toBe('image/png')
    expect((photo.body as Buffer).equals(PNG)).toBe(true)

    const file = await request(t.app).get(`/api/reports/${reportId}/file`).set(bearer(engineer))
    expect(file.status).toBe(200)
    expect(file.headers['content-type']).toMatch(/^text\/csv/)
    expect(file.text).toContain('0.4,0.7')
    expect(file.text).not.toMatch(/(^|[\n,])=HYPERLINK/)
    expect(file.text).toContain('HYPERLINK')
  })

  it('asks for a sign-in before sending a stored file', async () => {
    const res = await upload(STAND_CSV)
    expect(res.status).toBe(201)
    const anonymous = await request(t.app).get(`/api/reports/${res.body.report.id}/file`)
    expect(anonymous.status).toBe(401)
    const missing = await request(t.app).get(`/api/reports/${res.body.report.id + 1000}/file`).set(bearer(engineer))
    expect(missing.status).toBe(404)
  })

  it('leaves the bucket as it was when an upload is refused', async () => {
    const before = await bucketKeys()
    const bad = await upload(Buffer.from('displacement,force\n0,zero\n'), PNG)
    expect(bad.status).toBe(400)
    expect(await bucketKeys()).toEqual(before)
  })
})
