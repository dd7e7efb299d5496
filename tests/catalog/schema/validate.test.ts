import { describe, expect, it } from 'vitest'
import { ValidationError } from '../../../catalog/errors'
import { validateParams } from '../../../catalog/schema/validate'
import type { FamilyDefinition } from '../../../catalog/schema/types'

// A made-up family: only the schema parts matter to validation.
const family: FamilyDefinition = {
  id: 'test-beam', name: 'Test beam', kind: 'spring', summary: '',
  params: [
    { key: 'length', label: 'Length', unit: 'mm', default: 20, min: 5, max: 100, step: 0.5, help: '' },
    { key: 'thickness', label: 'Thickness', unit: 'mm', default: 1, min: 0.4, max: 5, step: 0.05, help: '', role: 'wall' },
    { key: 'count', label: 'Count', unit: '', default: 3, min: 1, max: 9, step: 1, help: '', integer: true },
  ],
  rules: [{ fields: ['thickness', 'length'], check: (p) => (p.thickness > p.length / 5 ? 'thickness must stay below a fifth of the length' : null) }],
  methods: [{ id: 'linear', label: 'Linear', source: 'Roark' }], defaultMethod: 'linear', metrics: [],
  axes: { displacement: { label: 'Displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } },
  evaluate: () => { throw new Error('not used') }, build: () => null, envelope: () => ({ x: 0, y: 0, z: 0 }), cautions: [],
}

function issuesOf(raw: unknown, options = {}) {
  try {
    validateParams(family, raw, options)
  } catch (e) {
    if (e instanceof ValidationError) return e.issues
    throw e
  }
  return []
}

describe('validateParams', () => {
  it('fills defaults for {} and resolves the default material', () => {
    const observed = validateParams(family, {})
    expect(observed.params).toEqual({ length: 20, thickness: 1, count: 3 })
    expect(observed.material.id).toBe('petg')
    expect(observed.material.modulus).toBe(2000)
  })

  it('names each bad field with its range and unit', () => {
    const observed = issuesOf({ length: 2, thickness: 'thick', count: 2.5 })
    expect(observed.map((i) => i.field).sort()).toEqual(['count', 'length', 'thickness'])
    expect(observed.find((i) => i.field === 'length')?.message).toMatch(/at least 5 mm/)
    expect(observed.find((i) => i.field === 'count')?.message).toMatch(/whole number/)
  })

  it('refuses unknown keys by name', () => {
    expect(issuesOf({ lenght: 20 })).toEqual([{ field: 'lenght', message: 'unknown parameter "lenght"' }])
  })

  it('applies cross-field rules after defaults', () => {
    expect(issuesOf({ length: 6, thickness: 2 })).toEqual([{ field: 'thickness', message: 'thickness must stay below a fifth of the length' }])
  })

  it('narrows to an entry\u2019s allowed ranges', () => {
    const observed = issuesOf({ length: 60 }, { ranges: { length: [10, 50] } })
    expect(observed[0].field).toBe('length')
    expect(observed[0].message).toMatch(/allowed for this entry 10–50 mm/)
  })

  it('lets modulus and strain limit override the material', () => {
    const observed = validateParams(family, { material: 'pla', modulus: 3000, strainLimit: 0.01 })
    expect(observed.material).toMatchObject({ id: 'pla', modulus: 3000, strainLimit: 0.01 })
    expect(observed.echo).toMatchObject({ material: 'pla', modulus: 3000, strainLimit: 0.01 })
  })

  it('uses a bare modulus as a custom material', () => {
    const observed = validateParams(family, { modulus: 1500 })
    expect(observed.material.id).toBeNull()
    expect(observed.material.modulus).toBe(1500)
  })

  it('reports an unknown material', () => {
    expect(issuesOf({ material: 'unobtainium' })).toEqual([{ field: 'material', message: 'unknown material "unobtainium"' }])
  })

  it('rejects a non-object', () => {
    expect(issuesOf([1, 2])[0].field).toBe('params')
    expect(issuesOf('x')[0].field).toBe('params')
  })
})
