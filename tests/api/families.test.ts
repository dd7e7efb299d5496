import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { evaluate, families, SolverError, UnknownFamilyError, ValidationError } from '../../catalog'
import { toHttpError } from '../../api/middleware/error-handler'
import { bearer, signInAs, startTestApp, type TestApp } from './helpers'

let t: TestApp
let token: string
beforeAll(async () => {
  t = await startTestApp()
  token = await signInAs(t.app, 'engineer')
})
afterAll(() => t.close())

describe('the catalog', () => {
  it('registers at least one family for the API to serve', () => {
    expect(families.length).toBeGreaterThan(0)
  })
})

describe('GET /api/families', () => {
  describe('as an engineer', () => {
    it('answers every registered family with its parameter schema and no functions', async () => {
      const res = await request(t.app).get('/api/families').set(bearer(token))
      expect(res.status).toBe(200)
      expect(res.body.families.map((f: { id: string }) => f.id)).toEqual(families.map((f) => f.id))
      for (const [i, family] of families.entries()) {
        const observed = res.body.families[i]
        expect(observed.params).toEqual(family.params)
        expect(observed.methods).toEqual(family.methods)
        expect(observed.rules).toEqual(family.rules.map((r) => ({ fields: r.fields })))
        expect(observed.designMap).toEqual(family.designMap ?? null)
        expect(observed.bendsBeams).toBe(family.bendsBeams === true)
        expect(Object.keys(observed).sort()).toEqual(['axes', 'bendsBeams', 'cautions', 'defaultMethod', 'designMap', 'id', 'kind', 'methods', 'metrics', 'name', 'params', 'rules', 'summary'])
      }
    })
  })
})

describe('GET /api/families/:id', () => {
  describe('as an engineer, for a registered family', () => {
    it('answers the family', async () => {
      const family = families[0]
      const res = await request(t.app).get(`/api/families/${family.id}`).set(bearer(token))
      expect(res.status).toBe(200)
      expect(res.body.family).toMatchObject({ id: family.id, name: family.name, kind: family.kind, defaultMethod: family.defaultMethod })
    })
  })

  describe('as an engineer, for an unknown family', () => {
    it('answers 404', async () => {
      const res = await request(t.app).get('/api/families/perpetual-motion').set(bearer(token))
      expect(res.status).toBe(404)
      expect(res.body.error).toMatchObject({ code: 'not_found', message: 'module family "perpetual-motion" not found' })
    })
  })
})

describe('POST /api/families/:id/evaluate', () => {
  for (const family of families) {
    describe(`as an engineer, ${family.id} with good parameters`, () => {
      it('answers exactly what the catalog computes', async () => {
        const params = Object.fromEntries(family.params.map((p) => [p.key, p.default]))
        const res = await request(t.app).post(`/api/families/${family.id}/evaluate`).set(bearer(token)).send({ params: { ...params, material: 'petg' } })
        expect(res.status).toBe(200)
        const expected = JSON.parse(JSON.stringify(evaluate(family.id, { ...params, material: 'petg' })))
        expect(res.body).toEqual(expected)
        expect(res.body.family).toBe(family.id)
        expect(res.body.curve.displacement.length).toBe(res.body.curve.force.length)
      })
    })
  }

  describe('as an engineer, with no parameters at all', () => {
    it('answers the family defaults', async () => {
      const family = families[0]
      const res = await request(t.app).post(`/api/families/${family.id}/evaluate`).set(bearer(token)).send({})
      expect(res.status).toBe(200)
      for (const spec of family.params) expect(res.body.params[spec.key]).toBe(spec.default)
    })
  })

  describe('as an engineer, with a parameter above its maximum', () => {
    it('answers 400 naming the field and its allowed range', async () => {
      const family = families[0]
      const spec = family.params[0]
      const res = await request(t.app).post(`/api/families/${family.id}/evaluate`).set(bearer(token)).send({ params: { [spec.key]: spec.max * 2 + 1 } })
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('validation_failed')
      const issues = res.body.error.details.issues
      expect(issues.map((i: { field: string }) => i.field)).toContain(spec.key)
      expect(issues.find((i: { field: string }) => i.field === spec.key).message).toContain(`${spec.label} must be at most`)
    })
  })

  describe('as an engineer, with an unknown parameter and a non-number', () => {
    it('answers 400 with one issue per field', async () => {
      const family = families[0]
      const spec = family.params[0]
      const res = await request(t.app).post(`/api/families/${family.id}/evaluate`).set(bearer(token)).send({ params: { wobble: 1, [spec.key]: 'wide' } })
      expect(res.status).toBe(400)
      const fields = res.body.error.details.issues.map((i: { field: string }) => i.field).sort()
      expect(fields).toEqual([spec.key, 'wobble'].sort())
    })
  })

  describe('as an engineer, with an unknown method', () => {
    it('answers 400 naming the method field', async () => {
      const res = await request(t.app).post(`/api/families/${families[0].id}/evaluate`).set(bearer(token)).send({ params: {}, method: 'guesswork' })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues[0].field).toBe('method')
    })
  })

  describe('as an engineer, with an unknown body field', () => {
    it('answers 400 naming it', async () => {
      const res = await request(t.app).post(`/api/families/${families[0].id}/evaluate`).set(bearer(token)).send({ params: {}, speed: 'fast' })
      expect(res.status).toBe(400)
      expect(res.body.error.details.issues).toEqual([{ field: 'speed', message: 'speed is not an accepted field' }])
    })
  })

  describe('as an engineer, for an unknown family', () => {
    it('answers 404', async () => {
      const res = await request(t.app).post('/api/families/perpetual-motion/evaluate').set(bearer(token)).send({ params: {} })
      expect(res.status).toBe(404)
      expect(res.body.error.code).toBe('not_found')
    })
  })

  describe('as an engineer, with a material a librarian recalibrated', () => {
    it('computes with the database numbers, not the built-in ones', async () => {
      const family = families[0]
      const before = await request(t.app).post(`/api/families/${family.id}/evaluate`).set(bearer(token)).send({ params: { material: 'petg' } })
      await t.context.db.models.Material.update({ modulus: 1000 }, { where: { id: 'petg' } })
      try {
        const after = await request(t.app).post(`/api/families/${family.id}/evaluate`).set(bearer(token)).send({ params: { material: 'petg' } })
        expect(before.body.material.modulus).toBe(2000)
        expect(after.body.material.modulus).toBe(1000)
        // linear elastic material: at the same geometry every force scales with the modulus
        const largest = (forces: number[]) => Math.max(...forces.map(Math.abs))
        expect(largest(after.body.curve.force) / largest(before.body.curve.force)).toBeCloseTo(0.5, 3)
      } finally {
        await t.context.db.models.Material.update({ modulus: 2000 }, { where: { id: 'petg' } })
      }
    })
  })

  describe('as an engineer, with a material only the database knows', () => {
    it('resolves it', async () => {
      await t.context.db.models.Material.create({ id: 'petg-lot-7', name: 'PETG lot 7 (calibrated)', process: 'FDM', modulus: 1850, poissonRatio: 0.41, poissonRatioSource: 'coupon test', strainLimit: 0.018, density: 1.27, source: 'coupon test' })
      const res = await request(t.app).post(`/api/families/${families[0].id}/evaluate`).set(bearer(token)).send({ params: { material: 'petg-lot-7' } })
      expect(res.status).toBe(200)
      expect(res.body.material).toEqual({ id: 'petg-lot-7', name: 'PETG lot 7 (calibrated)', modulus: 1850, strainLimit: 0.018, poissonRatio: 0.41 })
    })
  })
})

describe('the error handler', () => {
  describe('given a SolverError', () => {
    it('answers 422 solver_failed with its details', () => {
      const observed = toHttpError(new SolverError('no convergence at step 12', { step: 12 }))
      expect({ status: observed.status, code: observed.code, details: observed.details }).toEqual({ status: 422, code: 'solver_failed', details: { step: 12 } })
    })
  })

  describe('given a catalog ValidationError', () => {
    it('answers 400 validation_failed with the issues', () => {
      const observed = toHttpError(new ValidationError([{ field: 'span', message: 'Span must be at most 100 mm' }]))
      expect({ status: observed.status, code: observed.code, details: observed.details }).toEqual({ status: 400, code: 'validation_failed', details: { issues: [{ field: 'span', message: 'Span must be at most 100 mm' }] } })
    })
  })

  describe('given an UnknownFamilyError', () => {
    it('answers 404', () => {
      expect(toHttpError(new UnknownFamilyError('nope')).status).toBe(404)
    })
  })

  describe('given anything else', () => {
    it('answers 500 internal with a generic message', () => {
      const observed = toHttpError(new Error('secret stack detail'))
      expect({ status: observed.status, code: observed.code }).toEqual({ status: 500, code: 'internal' })
      expect(observed.message).not.toContain('secret')
    })
  })
})
