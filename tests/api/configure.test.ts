/**
 * Configuring an entry: POST /api/entries/:id/check, GET /api/entries/:id/curve.csv and
 * GET /api/entries/:id/datasheet. The fast closed-form methods are used wherever the test
 * is not about a particular method.
 */
import Papa from 'papaparse'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { evaluate, getFamily, type FamilyDefinition } from '../../catalog'
import { DEFAULT_TOLERANCE, toleranceBand } from '../../catalog/tolerance'
import type { Entry } from '../../api/db'
import { RETIRED_NOTICE, configureTarget } from '../../api/services/configure'
import { resolveConfiguration } from '../../api/services/configuration-input'
import { DATASHEET_CAUTIONS } from '../../api/services/datasheet'
import { mergeCautions } from '../../api/services/cautions'
import { curveCsvOf } from '../../api/services/downloads'
import { listMaterials } from '../../api/services/materials'
import { bearer, demoEmail, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
let engineer: string
let contributor: string
const ids = { switch: 0, guide: 0, hook: 0, draft: 0, retired: 0 }
let switchEntry: Entry

const q = (value: unknown) => encodeURIComponent(JSON.stringify(value))
const BISTABLE_WINDOW = { kind: 'bistable', peakForce: { min: 1, max: 20 }, holdingForce: { min: 0.1 }, travel: { max: 8 } }

beforeAll(async () => {
  t = await startTestApp()
  const { Entry, User } = t.context.db.models
  const byName = async (name: string) => (await Entry.findOne({ where: { name } }))!
  switchEntry = await byName('Power switch, field node shell S1')
  ids.switch = switchEntry.id
  ids.guide = (await byName('Rain sensor plunger guide, weather mast W1')).id
  ids.hook = (await byName('Battery door snap hook, field node shell S1')).id
  ids.draft = (await byName('Soft-touch switch, soil probe P3 (proposal)')).id
  // retired directly through the model: the retire route belongs to curation
  const librarian = (await User.findOne({ where: { email: demoEmail('librarian') } }))!
  const retired = await Entry.create({
    familyId: 'snap-hook', name: 'Retired lid hook', summary: '', tags: [], status: 'retired', defaultParams: { length: 10 },
    ranges: { length: [8, 12] }, materials: ['petg'], ownerId: librarian.id, currentRevisionId: null,
  })
  ids.retired = retired.id
  engineer = await signInAs(t.app, 'engineer')
  contributor = await signInAs(t.app, 'contributor')
})
afterAll(() => t.close())

const check = (id: number, body: unknown, token = engineer) => request(t.app).post(`/api/entries/${id}/check`).set(bearer(token)).send(body as object)

function fields(res: request.Response): string[] {
  return res.body.error.details.issues.map((i: { field: string }) => i.field)
}

describe('POST /api/entries/:id/check', () => {
  describe('as an engineer, for a released bistable entry with a force window', () => {
    let res: request.Response
    beforeAll(async () => {
      res = await check(ids.switch, { params: { thickness: 0.8 }, method: 'closed-form', window: BISTABLE_WINDOW, tolerance: { thickness: 0.05, modulus: 0.1 }, printer: { nozzle: 0.4, layer: 0.2 } })
    })

    it('answers the nominal evaluation the catalog gives for the entry defaults overlaid with the parameters', () => {
      expect(res.status, JSON.stringify(res.body)).toBe(200)
      const expected = evaluate('bistable-beam', { ...switchEntry.defaultParams, thickness: 0.8 }, { method: 'closed-form', ranges: switchEntry.ranges })
      expect(res.body.evaluation.params).toEqual(expected.params)
      expect(res.body.evaluation.metrics).toEqual(expected.metrics)
      expect(res.body.evaluation.curve.force).toEqual(expected.curve.force)
    })

    it('answers a tolerance band that holds the nominal curve and every metric', () => {
      const { band, evaluation } = res.body
      expect(band.tolerance).toEqual({ thickness: 0.05, modulus: 0.1 })
      expect(band.defaulted).toBe(false)
      expect(band.curve.displacement).toEqual(evaluation.curve.displacement)
      evaluation.curve.force.forEach((f: number, i: number) => {
        expect(band.curve.low[i]).toBeLessThanOrEqual(f + 1e-12)
        expect(band.curve.high[i]).toBeGreaterThanOrEqual(f - 1e-12)
      })
      const [low, high] = band.metrics.peakForce
      expect(low).toBeLessThan(evaluation.metrics.peakForce)
      expect(high).toBeGreaterThan(evaluation.metrics.peakForce)
    })

    it('answers the verdict for nominal and for the whole band, with a margin per bound', () => {
      const { verdict } = res.body
      expect(verdict.nominal.verdict).toBe('inside')
      expect(verdict.band.constraints.map((c: { id: string }) => c.id)).toEqual(['peakForce.min', 'peakForce.max', 'holdingForce.min', 'travel.max', 'bistable'])
      for (const c of verdict.band.constraints.filter((c: { margin: number | null }) => c.margin !== null)) expect(Number.isFinite(c.margin)).toBe(true)
    })

    it('answers the printability checks, marked common practice, and no notices', () => {
      const { printability, notices, envelope } = res.body
      expect(printability.basis).toMatch(/common practice/)
      expect(printability.printer).toMatchObject({ nozzle: 0.4, layer: 0.2, minimumWall: 0.8 })
      // 0.8 mm is two 0.4 mm perimeters (common practice, docs/references.md §8): no wall problem
      expect(printability.checks.find((c: { id: string }) => c.id === 'wall.thickness').level).toBe('ok')
      expect(notices).toEqual([])
      expect(envelope).toEqual(getFamily('bistable-beam').envelope(res.body.evaluation.params))
    })
  })

  describe('a window the nominal part meets but a thinner printed part does not', () => {
    it('answers inside for nominal and outside for the band', async () => {
      const base = await check(ids.switch, { params: { thickness: 0.8 }, method: 'closed-form' })
      const [low] = base.body.band.metrics.peakForce
      const nominal = base.body.evaluation.metrics.peakForce
      // the minimum sits between the thin corner and the nominal value, well clear of the edge band
      const window = { kind: 'bistable', peakForce: { min: low + 0.5 * (nominal - low), max: 1.5 * nominal } }
      const res = await check(ids.switch, { params: { thickness: 0.8 }, method: 'closed-form', window })
      expect(res.body.verdict.nominal.verdict).toBe('inside')
      expect(res.body.verdict.band.verdict).toBe('outside')
    })
  })

  describe('for a parallel guide (linear method)', () => {
    it('answers the Roark stiffness and a band that follows the cube of the wall thickness', async () => {
      // wideBeam 'off': Roark's plain beam theory, at the nominal point and every corner (the plate factor: tests/catalog/mechanics)
      const res = await check(ids.guide, { params: { length: 20, thickness: 0.8, depth: 6, material: 'petg', wideBeam: 'off' }, method: 'linear', tolerance: { thickness: 0.05, modulus: 0.1 } })
      expect(res.status, JSON.stringify(res.body)).toBe(200)
      expect(res.body.evaluation.bending.factor).toBe(1)
      // Roark 7th ed., fixed-guided beam k = 12EI/L³, two blades: k = 24·E·(b·t³/12)/L³ with E = 2000 MPa (PETG)
      const E = res.body.evaluation.material.modulus
      const expected = (24 * E * ((6 * 0.8 ** 3) / 12)) / 20 ** 3
      expect(res.body.evaluation.metrics.stiffness).toBeCloseTo(expected, 6)
      const [low, high] = res.body.band.metrics.stiffness
      expect(low).toBeCloseTo(expected * (0.75 / 0.8) ** 3 * 0.9, 6)
      expect(high).toBeCloseTo(expected * (0.85 / 0.8) ** 3 * 1.1, 6)
    })
  })

  describe('without a tolerance, window or printer', () => {
    it('uses the common-practice tolerance and says so, and judges nothing', async () => {
      const res = await check(ids.hook, { params: {} })
      expect(res.status).toBe(200)
      expect(res.body.band).toMatchObject({ tolerance: { ...DEFAULT_TOLERANCE }, defaulted: true })
      expect(res.body.band.note).toMatch(/common FDM practice/)
      expect(res.body.verdict).toBeNull()
      expect(res.body.printability.printer).toMatchObject({ nozzle: 0.4, layer: 0.2 })
    })

    it('fills the parameters from the entry, not from the family', async () => {
      const res = await check(ids.switch, { method: 'closed-form' })
      expect(res.body.evaluation.params).toMatchObject({ span: 60, apexHeight: 2.1, thickness: 0.7, material: 'petg' })
    })
  })

  describe('with a parameter outside the entry\u2019s allowed range (inside the family\u2019s)', () => {
    it('answers 400 naming the parameter and the entry range', async () => {
      const res = await check(ids.switch, { params: { thickness: 1.0 }, method: 'closed-form' })
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('validation_failed')
      expect(fields(res)).toEqual(['thickness'])
      expect(res.body.error.message).toMatch(/at most 0\.9 mm \(allowed for this entry 0\.6–0\.9 mm\)/)
    })
  })

  describe('with several bad fields', () => {
    it('answers one issue per field, each naming it', async () => {
      const res = await check(ids.switch, {
        params: { span: 'long', colour: 'red' }, method: 'guesswork',
        window: { kind: 'bistable', peakForce: { min: -1 } }, tolerance: { thickness: 2 }, printer: { nozzle: 0.4, layer: 0.6 },
      })
      expect(res.status).toBe(400)
      expect(fields(res).sort()).toEqual(['colour', 'method', 'printer.layer', 'span', 'tolerance.thickness', 'window.peakForce.min'])
    })
  })

  describe('with a window of another kind', () => {
    it('answers 400 naming window.kind', async () => {
      const res = await check(ids.switch, { method: 'closed-form', window: { kind: 'spring', stiffness: { min: 1 } } })
      expect(res.status).toBe(400)
      expect(fields(res)).toEqual(['window.kind'])
    })
  })

  describe('with a material the entry is not released for', () => {
    it('answers 400 naming material and the released ones', async () => {
      const res = await check(ids.switch, { params: { material: 'pla' }, method: 'closed-form' })
      expect(res.status).toBe(400)
      expect(fields(res)).toEqual(['material'])
      expect(res.body.error.message).toMatch(/petg, abs/)
    })
  })

  describe('with an unknown field or a body that is not an object', () => {
    it('answers 400 naming the field', async () => {
      expect(fields(await check(ids.hook, { params: {}, colour: 'red' }))).toEqual(['colour'])
      const res = await check(ids.hook, [1, 2])
      expect(res.status).toBe(400)
      expect(res.body.error.message).toMatch(/JSON object/)
    })
  })

  describe('for an unknown entry, a malformed id or a draft the engineer may not see', () => {
    it('answers 404', async () => {
      expect((await check(999999, {})).status).toBe(404)
      expect((await check('abc' as unknown as number, {})).status).toBe(404)
      expect((await check(ids.draft, {})).status).toBe(404)
    })
  })

  describe('for the contributor\u2019s own draft', () => {
    it('answers the check with a notice that it is not released', async () => {
      // the closed form holds for rigidly clamped ends only, so the draft's side posts go
      const res = await check(ids.draft, { params: { postLength: 0 }, method: 'closed-form' }, contributor)
      expect(res.status).toBe(200)
      expect(res.body.notices.join(' ')).toMatch(/not released/)
    })
  })

  describe('for a retired entry', () => {
    it('still answers the check, with the retired notice', async () => {
      const res = await check(ids.retired, { params: { length: 11 } })
      expect(res.status).toBe(200)
      expect(res.body.notices).toEqual([RETIRED_NOTICE])
      expect(res.body.entry.status).toBe('retired')
    })
  })
})

describe('GET /api/entries/:id/curve.csv', () => {
  const csv = (id: number, query: string) => request(t.app).get(`/api/entries/${id}/curve.csv?${query}`).set(bearer(engineer))

  describe('with parameters', () => {
    it('answers the predicted curve with a header naming quantities and units, and the strain', async () => {
      const res = await csv(ids.hook, `params=${q({ length: 11 })}`)
      expect(res.status).toBe(200)
      expect(res.headers['content-type']).toBe('text/csv; charset=utf-8')
      expect(res.headers['content-disposition']).toMatch(/^attachment; filename="battery-door-snap-hook-field-snap-hook-length11-rt1\.6-tt1-width6-u0\.8-ea30-ra60-f0\.4-curve\.csv"$/)
      const parsed = Papa.parse<string[]>(res.text.trim())
      const [header, ...rows] = parsed.data
      expect(header).toEqual(['Insertion travel (mm)', 'Insertion force (N)', 'Strain (fraction)'])
      const expected = evaluate('snap-hook', { ...((await t.context.db.models.Entry.findByPk(ids.hook))!.defaultParams), length: 11 })
      expect(rows).toHaveLength(expected.curve.displacement.length)
      // written to six significant digits
      const six = (v: number) => Number(v.toPrecision(6))
      rows.forEach((row, i) => {
        expect(row.map(Number)).toEqual([six(expected.curve.displacement[i]), six(expected.curve.force[i]), six(expected.curve.strain![i])])
      })
    })
  })

  describe('with a tolerance', () => {
    it('adds the band\u2019s low and high force, around the nominal force', async () => {
      const res = await csv(ids.switch, `params=${q({ thickness: 0.8 })}&method=closed-form&tolerance=${q({ thickness: 0.05, modulus: 0.1 })}`)
      const [header, ...rows] = Papa.parse<string[]>(res.text.trim()).data
      expect(header.slice(3)).toEqual([
        'Force, tolerance low at ±0.05 mm walls, ±10 % modulus (N)',
        'Force, tolerance high at ±0.05 mm walls, ±10 % modulus (N)',
      ])
      expect(header[0]).toBe('Shuttle displacement (mm)')
      for (const row of rows) {
        const [, force, , low, high] = row.map(Number)
        expect(low).toBeLessThanOrEqual(force)
        expect(high).toBeGreaterThanOrEqual(force)
      }
      // negative forces past the snap stay numbers: only text cells are guarded against formulas
      expect(rows.some((r) => r[1].startsWith('-'))).toBe(true)
    })
  })

  describe('with malformed params JSON in the query', () => {
    it('answers 400 naming params', async () => {
      const res = await csv(ids.hook, 'params=%7Blength%3A')
      expect(res.status).toBe(400)
      expect(fields(res)).toEqual(['params'])
    })
  })

  describe('with params out of range, an unknown query field or a repeated one', () => {
    it('answers 400 naming the field', async () => {
      expect(fields(await csv(ids.hook, `params=${q({ length: 40 })}`))).toEqual(['length'])
      expect(fields(await csv(ids.hook, 'colour=red'))).toEqual(['colour'])
      expect(fields(await csv(ids.hook, 'method=a&method=b'))).toEqual(['method'])
    })
  })

  describe('for an unknown entry', () => {
    it('answers 404', async () => {
      expect((await csv(999999, '')).status).toBe(404)
    })
  })
})

describe('the curve CSV writer', () => {
  describe('with axis labels a spreadsheet would run as formulas', () => {
    it('puts an apostrophe before each such text cell', async () => {
      const hook = getFamily('snap-hook')
      // a made-up family whose model names its axes like a formula
      const hostile: FamilyDefinition = {
        ...hook,
        evaluate: (input) => {
          const out = hook.evaluate(input)
          return { ...out, curve: { ...out.curve, axes: { displacement: { label: '=HYPERLINK("x")', unit: '' }, force: { label: '@SUM(A1)', unit: '' } } } }
        },
      }
      const entry = (await t.context.db.models.Entry.findByPk(ids.hook))!
      const target = { ...(await configureTarget(t.context, entry)), family: hostile }
      const materials = await listMaterials(t.context)
      const input = resolveConfiguration({ params: {} }, { family: hostile, defaults: entry.defaultParams, releasedMaterials: entry.materials, ranges: entry.ranges, materials })
      const band = toleranceBand(hostile, input.params, { ranges: target.ranges, materials: target.materials })
      const observed = Papa.parse<string[]>(String(curveCsvOf(target, input, band).body).trim()).data[0]
      expect(observed.slice(0, 2)).toEqual(['\'=HYPERLINK("x")', "'@SUM(A1)"])
    })
  })
})

describe('GET /api/entries/:id/datasheet', () => {
  it('answers the data sheet sections the PDF is drawn from', async () => {
    const before = new Date().toISOString().slice(0, 10)
    const res = await request(t.app)
      .get(`/api/entries/${ids.switch}/datasheet?params=${q({ thickness: 0.8 })}&method=closed-form&window=${q(BISTABLE_WINDOW)}`)
      .set(bearer(engineer))
    const after = new Date().toISOString().slice(0, 10)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const sheet = res.body.datasheet
    expect([before, after]).toContain(sheet.date)
    expect(sheet.entry).toMatchObject({ id: ids.switch, name: 'Power switch, field node shell S1', status: 'released', revision: { number: 1 } })
    expect(sheet.family).toEqual({ id: 'bistable-beam', name: 'Bistable curved-beam switch', kind: 'bistable' })
    expect(sheet.parameters.find((p: { key: string }) => p.key === 'thickness')).toEqual({ key: 'thickness', label: 'Beam thickness', value: 0.8, unit: 'mm' })
    expect(sheet.material).toMatchObject({ id: 'petg', modulus: 2000, strainLimit: 0.02 })
    expect(sheet.material.source).toMatch(/MDPI/)
    const { bending, ...method } = sheet.method
    expect(method).toEqual({ ...getFamily('bistable-beam').methods.find((m) => m.id === 'closed-form') })
    // the wide-beam rule as applied, for "How this is computed"
    expect(bending).toMatch(/^(Wide|Narrow) beam \(beams: depth [\d.]+ × thickness/)
    expect(sheet.metrics.find((m: { key: string }) => m.key === 'peakForce')).toMatchObject({ label: 'Peak force', unit: 'N' })
    expect(sheet.verdict.nominal.verdict).toBe('inside')
    expect(sheet.printability.basis).toMatch(/common practice/)
    expect(sheet.cautions).toEqual(mergeCautions(DATASHEET_CAUTIONS, getFamily('bistable-beam').cautions))
    expect(sheet.cautions).toContain(DATASHEET_CAUTIONS[DATASHEET_CAUTIONS.length - 1])
    expect(sheet.fileName).toBe('power-switch-field-node-shell-s1-bistable-beam-span60-ah2.1-t0.8-depth6-pl0-datasheet.pdf')
  })

  it('marks the stable and unstable positions and draws the window in the curve\u2019s units', async () => {
    const res = await request(t.app)
      .get(`/api/entries/${ids.switch}/datasheet?params=${q({ thickness: 0.8 })}&method=closed-form&window=${q(BISTABLE_WINDOW)}`)
      .set(bearer(engineer))
    const { curve, metrics } = res.body.datasheet
    const metric = (key: string) => metrics.find((m: { key: string }) => m.key === key).value
    expect(curve.markers.map((m: { kind: string; displacement: number }) => [m.kind, m.displacement])).toEqual([
      ['stable', 0], ['unstable', metric('unstablePosition')], ['stable', metric('secondStablePosition')],
    ])
    for (const m of curve.markers) expect(Math.abs(m.force)).toBeLessThan(0.05 * metric('peakForce'))
    expect(curve.window).toEqual([
      { kind: 'force-range', id: 'peakForce', label: 'Peak force at least 1 N, at most 20 N', min: 1, max: 20 },
      { kind: 'force-range', id: 'holdingForce', label: 'Holding force at least 0.1 N (valley at or below its negative)', min: null, max: -0.1 },
      { kind: 'displacement-range', id: 'travel', label: 'Travel at most 8 mm', min: null, max: 8 },
    ])
  })

  it('answers 400 for a bad window and 404 for an unknown entry', async () => {
    const bad = await request(t.app).get(`/api/entries/${ids.switch}/datasheet?window=${q({ kind: 'bistable', peakForce: { min: 5, max: 3 } })}`).set(bearer(engineer))
    expect(bad.status).toBe(400)
    expect(fields(bad)).toEqual(['window.peakForce.min'])
    expect((await request(t.app).get('/api/entries/999999/datasheet').set(bearer(engineer))).status).toBe(404)
  })
})
