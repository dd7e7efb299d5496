/**
 * A seventh family from a test folder (tests/families/trial-cantilever), registered at run time:
 * evaluate, STL, the configure check over HTTP, search and the design map find it through the
 * registry alone — no list anywhere else names it. Every number is judged against Roark's
 * cantilever formulas (Young & Budynas, Roark's Formulas for Stress and Strain, 7th ed., 2002,
 * Table 8.1 case 1a: tip deflection y = F L³ / (3 E I), I = b t³ / 12), computed here by hand.
 */
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { buildGeometry, defineFamily, evaluate, families, findBuiltinMaterial, getFamily, registerFamily, searchShelfSync, serializeStl, type Shelf } from '../../catalog'
import { estimateAllowance } from '../../catalog/search/estimate-tolerance'
import { estimatorFor } from '../../catalog/search/estimators'
import { computeDesignMap } from '../../web/src/composables/designMapCompute'
import { trialCantilever } from '../families/trial-cantilever'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

const ID = 'trial-cantilever'
const PETG = findBuiltinMaterial('petg')!
/** Roark 7th ed., Table 8.1 case 1a. */
const roarkStiffness = (E: number, b: number, t: number, L: number) => (3 * E * (b * t ** 3) / 12) / L ** 3
/** Root strain of an end-loaded cantilever at tip deflection δ: ε = Mc/(EI) = 3tδ/(2L²). */
const roarkRootStrain = (t: number, L: number, delta: number) => (3 * t * delta) / (2 * L * L)

let unregister: () => void
let t: TestApp
let engineer: string
let entryId: number

beforeAll(async () => {
  unregister = registerFamily(trialCantilever)
  t = await startTestApp()
  const { Entry, EntryRevision, User } = t.context.db.models
  const librarian = (await User.findOne({ where: { role: 'librarian' } }))!
  const defaults = { length: 20, thickness: 1, depth: 6, material: 'petg' }
  const nominal = evaluate(ID, defaults)
  const entry = await Entry.create({
    familyId: ID, name: 'Trial cantilever, bench rig R1', summary: 'A made-up family on the shelf.', tags: ['trial'], status: 'released',
    defaultParams: nominal.params, ranges: { length: [10, 40], thickness: [0.6, 2] }, materials: ['petg'], ownerId: librarian.id, currentRevisionId: null,
  })
  const revision = await EntryRevision.create({
    entryId: entry.id, number: 1, params: nominal.params, ranges: entry.ranges, method: nominal.method,
    curve: nominal.curve, metrics: nominal.metrics, warnings: nominal.warnings, createdById: librarian.id,
  })
  await entry.update({ currentRevisionId: revision.id }, { silent: true })
  entryId = entry.id
  engineer = await signInAs(t.app, 'engineer')
})

afterAll(async () => {
  await t?.close()
  unregister?.()
})

describe('a family registered from its folder', () => {
  it('joins the registry after the built-in families, once', () => {
    expect(families.at(-1)).toBe(trialCantilever)
    expect(getFamily(ID)).toBe(trialCantilever)
    expect(() => registerFamily(trialCantilever)).toThrow(/already registered/)
  })

  it('evaluates to Roark\u2019s cantilever stiffness and root strain', () => {
    const e = evaluate(ID, { length: 25, thickness: 1.2, depth: 8, material: 'petg' })
    const k = roarkStiffness(PETG.modulus, 8, 1.2, 25)
    expect(e.metrics.stiffness).toBeCloseTo(k, 9)
    const travel = e.metrics.maxTravel as number
    // the travel ends at the strain limit or at a fifth of the length, whichever comes first
    expect(travel).toBeCloseTo(Math.min(PETG.strainLimit / roarkRootStrain(1.2, 25, 1), 0.2 * 25), 9)
    expect(e.metrics.maxStrain).toBeCloseTo(roarkRootStrain(1.2, 25, travel), 12)
    expect(e.curve.force.at(-1)).toBeCloseTo(k * travel, 9)
    expect(e.source).toMatch(/Roark/)
  })

  it('refuses its own cross rule by field', () => {
    expect(() => evaluate(ID, { length: 6, thickness: 1 })).toThrow(/thickness/)
  })

  it('builds a closed STL whose box is the base and blade', () => {
    const stl = serializeStl(buildGeometry(ID, { length: 30, thickness: 1, depth: 5 }))
    const view = new DataView(stl.buffer, stl.byteOffset, stl.byteLength)
    const triangles = view.getUint32(80, true)
    expect(stl.byteLength).toBe(84 + 50 * triangles)
    const min = [Infinity, Infinity, Infinity]
    const max = [-Infinity, -Infinity, -Infinity]
    for (let i = 0; i < triangles; i++) {
      for (let v = 0; v < 3; v++) {
        for (let a = 0; a < 3; a++) {
          const x = view.getFloat32(84 + 50 * i + 12 + 12 * v + 4 * a, true)
          min[a] = Math.min(min[a], x)
          max[a] = Math.max(max[a], x)
        }
      }
    }
    // a 6 mm base block behind a 30 mm blade, 5 mm deep (geometry.ts)
    expect(max.map((m, a) => m - min[a])).toEqual([36, 6, 5].map((v) => expect.closeTo(v, 3)))
  })

  it('is checked by the configure screen\u2019s check over HTTP', async () => {
    const res = await request(t.app).post(`/api/entries/${entryId}/check`).set(bearer(engineer))
      .send({ params: { length: 30, thickness: 1 }, window: { kind: 'spring', stiffness: { min: 0.1, max: 5 } } })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.evaluation.family).toBe(ID)
    expect(res.body.evaluation.metrics.stiffness).toBeCloseTo(roarkStiffness(PETG.modulus, 6, 1, 30), 9)
    expect(res.body.verdict.nominal.verdict).toMatch(/inside|edge/)
    expect(res.body.envelope).toEqual({ x: 36, y: 6, z: 6 })
    // the band spans the tolerance corners: thickness ± the default tolerance, modulus ± its fraction
    const { thickness: dt, modulus: dm } = res.body.band.tolerance
    const [low, high] = res.body.band.metrics.stiffness
    expect(low).toBeCloseTo(roarkStiffness(PETG.modulus * (1 - dm), 6, 1 - dt, 30), 9)
    expect(high).toBeCloseTo(roarkStiffness(PETG.modulus * (1 + dm), 6, 1 + dt, 30), 9)
  })

  it('is found by search, ranked on its own estimator, and confirmed', () => {
    const shelf: Shelf = [{ id: 'trial', familyId: ID, name: 'Trial cantilever', summary: '', tags: [], materials: ['petg'], defaultParams: { length: 20, thickness: 1, depth: 6 }, ranges: { length: [10, 40], thickness: [0.6, 2] }, status: 'released' }]
    // a soft spring: 0.2–0.4 N/mm, which the blade reaches only near its long and thin corner
    const answer = searchShelfSync({ kind: 'spring', stiffness: { min: 0.2, max: 0.4 }, limit: 3 }, shelf, { budget: 400, confirm: 1 })
    // the engine takes the folder's estimator through the registry, not its fallback over the model
    expect(estimatorFor(getFamily(ID))).toBe(trialCantilever.search!.estimator)
    expect(answer.results.length).toBeGreaterThan(0)
    for (const r of answer.results) {
      expect(r.family).toBe(ID)
      const p = r.params as Record<string, number>
      const k = roarkStiffness(PETG.modulus, p.depth, p.thickness, p.length)
      expect(r.metrics.stiffness).toBeCloseTo(k, 9)
      expect(k).toBeGreaterThanOrEqual(0.2 * 0.999)
      expect(k).toBeLessThanOrEqual(0.4 * 1.001)
    }
    expect(answer.results[0].confirmed?.metrics?.stiffness).toBeCloseTo(answer.results[0].metrics.stiffness as number, 9)
    // its folder states no estimate allowance: its estimate is its own closed form
    expect(estimateAllowance(ID, answer.results[0].metrics, answer.results[0].params)).toEqual({})
  })

  it('is mapped by the design map with its folder\u2019s estimator', () => {
    const map = computeDesignMap({
      familyId: ID, params: { length: 20, thickness: 1, depth: 6 }, modulus: PETG.modulus, strainLimit: PETG.strainLimit, bending: { poissonRatio: 0.38, wideBeam: 'auto' },
      x: { key: 'length', min: 10, max: 40 }, y: { key: 'thickness', min: 0.6, max: 2 }, window: null, size: 8,
    })
    expect(map.values.stiffness).toHaveLength(64)
    for (let j = 0; j < 8; j++) {
      for (let i = 0; i < 8; i++) {
        const c = j * 8 + i
        // cells thicker than an eighth of the length break the family's rule and stay empty
        if (map.ys[j] > map.xs[i] / 8) { expect(map.reasons[c]).toBe('rules'); continue }
        expect(map.values.stiffness[c]).toBeCloseTo(roarkStiffness(PETG.modulus, 6, map.ys[j], map.xs[i]), 9)
      }
    }
  })
})

describe('defineFamily', () => {
  const parts = (over: Partial<Parameters<typeof defineFamily>[1]['model']> = {}) => ({
    params: { params: trialCantilever.params, rules: trialCantilever.rules },
    model: { methods: trialCantilever.methods, metrics: trialCantilever.metrics, axes: trialCantilever.axes, evaluate: trialCantilever.evaluate, ...over },
    geometry: { build: trialCantilever.build, envelope: trialCantilever.envelope },
  })
  const identity = { id: 'another-trial', name: 'x', kind: 'spring' as const, summary: '', cautions: ['confirm on printed parts'] }

  it('defaults to the first method and keeps the folder\u2019s parts', () => {
    const f = defineFamily(identity, parts())
    expect(f.defaultMethod).toBe('linear')
    expect(f.params).toBe(trialCantilever.params)
    expect(f.evaluate).toBe(trialCantilever.evaluate)
  })

  it('refuses parts that disagree, naming each problem', () => {
    expect(() => defineFamily({ ...identity, defaultMethod: 'fem' }, parts())).toThrow(/defaultMethod "fem" is not one of its methods/)
    expect(() => defineFamily({ ...identity, id: 'Bad Id' }, parts())).toThrow(/id "Bad Id"/)
    expect(() => defineFamily({ ...identity, designMap: { sweep: ['length', 'width'] } }, parts())).toThrow(/sweep names "width"/)
    expect(() => defineFamily({ ...identity, cautions: [] }, parts())).toThrow(/cautions/)
    expect(() => defineFamily(identity, parts({ metrics: [...trialCantilever.metrics, trialCantilever.metrics[0]] }))).toThrow(/metric "stiffness" is declared twice/)
    const estimator = { ...trialCantilever.search!.estimator, reproduces: 'nonlinear-fe' }
    expect(() => defineFamily({ ...identity, search: { estimator } }, parts())).toThrow(/reproduces "nonlinear-fe"/)
  })
})
