import { describe, expect, it } from 'vitest'
import { families } from '@catalog/registry'
import { estimatorFor } from '@catalog/search'
import { cellOf, linspace, snapToStep } from '@/composables/designMap'
import { computeDesignMap, familyOf, mapEstimatorOf } from '@/composables/designMapCompute'

const SWITCH = { span: 60, apexHeight: 2.1, thickness: 0.7, depth: 6, postLength: 0 }
const PETG = { modulus: 2000, strainLimit: 0.02, bending: { poissonRatio: 0.38, wideBeam: 'auto' as const } }
const sweep = (window: unknown = null) => computeDesignMap({
  familyId: 'bistable-beam', params: SWITCH, ...PETG,
  x: { key: 'apexHeight', min: 0.8, max: 3 }, y: { key: 'thickness', min: 0.4, max: 1.2 }, window,
})

describe('computeDesignMap (bistable-beam, apex height × thickness)', () => {
  const map = sweep({ kind: 'bistable', peakForce: { min: 2, max: 6 }, holdingForce: { min: 0.3 } })

  it('is a 60 × 60 grid over the given ranges', () => {
    expect(map.size).toBe(60)
    expect(map.xs[0]).toBe(0.8)
    expect(map.xs[59]).toBeCloseTo(3, 12)
    expect(map.state).toHaveLength(3600)
    expect(map.values.peakForce).toHaveLength(3600)
  })

  it('offers only what the fast estimate gives: the largest force is read off the exact curve, so the map has no values for it', () => {
    expect(Object.keys(map.values)).toContain('peakForce')
    expect(Object.keys(map.values)).not.toContain('largestForce')
    for (const values of Object.values(map.values)) expect(values.some((v) => v !== null)).toBe(true)
  })

  it('gives each cell the fast estimate at its parameters', () => {
    const estimator = mapEstimatorOf(familyOf('bistable-beam'))
    for (const [i, j] of [[30, 30], [55, 10], [45, 50]]) {
      const expected = estimator.estimate({ ...SWITCH, apexHeight: map.xs[i], thickness: map.ys[j] }, PETG.modulus, PETG.strainLimit, PETG.bending)
      expect(map.values.peakForce[j * 60 + i]).toBe(expected.peakForce)
    }
  })

  it('marks beams with h/t below 2.31 monostable and those above bistable (Qiu, Lang & Slocum 2004, clamped cosine beam with the second mode constrained)', () => {
    for (let c = 0; c < 3600; c++) {
      if (map.state[c] === 'invalid') continue
      const q = map.xs[c % 60] / map.ys[Math.floor(c / 60)]
      if (q < 2.25) expect(map.state[c], `Q = ${q}`).toBe('monostable')
      if (q > 2.4) expect(map.state[c], `Q = ${q}`).toBe('ok')
    }
  })

  it('has peak force rising with thickness at a fixed apex height (stiffer beam, F ∝ E·b·t³/l³ scaling, Qiu et al. 2004)', () => {
    const i = 50
    const column = Array.from({ length: 60 }, (_, j) => map.values.peakForce[j * 60 + i]).filter((v): v is number => v !== null)
    expect(column.length).toBeGreaterThan(10)
    for (let k = 1; k < column.length; k++) expect(column[k]).toBeGreaterThan(column[k - 1])
  })

  it('outlines only cells whose metrics meet the window, never a monostable one', () => {
    expect(map.hasWindow).toBe(true)
    const inside = map.meets.map((m, c) => (m ? c : -1)).filter((c) => c >= 0)
    expect(inside.length).toBeGreaterThan(0)
    for (const c of inside) {
      expect(map.state[c]).toBe('ok')
      expect(map.values.peakForce[c]!).toBeGreaterThanOrEqual(2)
      expect(map.values.peakForce[c]!).toBeLessThanOrEqual(6)
      expect(-map.values.valleyForce[c]!).toBeGreaterThanOrEqual(0.3)
    }
  })

  it('meets nothing without a window', () => {
    const plain = sweep()
    expect(plain.hasWindow).toBe(false)
    expect(plain.meets.some(Boolean)).toBe(false)
  })
})

describe('the map\u2019s families', () => {
  it('are the registry\u2019s families, with the same parameters, rules, metrics and methods', () => {
    expect(families.map((f) => familyOf(f.id).id)).toEqual(families.map((f) => f.id))
    for (const family of families) {
      const light = familyOf(family.id)
      expect(light.params).toBe(family.params)
      expect(light.rules).toBe(family.rules)
      expect(light.metrics).toBe(family.metrics)
      expect(light.methods).toBe(family.methods)
    }
  })

  it('each have the fast estimator search uses', () => {
    for (const family of families) expect(mapEstimatorOf(familyOf(family.id))).toBe(estimatorFor(family))
  })

  it('refuse an unknown family by name', () => {
    expect(() => familyOf('made-up')).toThrow(/unknown module family "made-up"/)
  })
})

describe('map helpers', () => {
  it('linspace spans both ends', () => expect(linspace(1, 2, 5)).toEqual([1, 1.25, 1.5, 1.75, 2]))
  it('cellOf finds the nearest cell and refuses points off the map', () => {
    const map = { xs: linspace(0, 10, 11), ys: linspace(0, 1, 11) }
    expect(cellOf(map, 4.4, 0.56)).toEqual({ i: 4, j: 6 })
    expect(cellOf(map, 12, 0.5)).toBeNull()
  })
  it('snapToStep rounds to the parameter step inside its limits', () => {
    expect(snapToStep(2.1234, 0.05, 1.8, 2.6)).toBe(2.1)
    expect(snapToStep(0.987, 0.05, 0.6, 0.9)).toBe(0.9)
  })
})

describe('regionEdges', () => {
  it('outlines a 2 × 2 block of meeting cells by its eight outer sides only', async () => {
    const { regionEdges } = await import('@/composables/designMapChart')
    const size = 4
    const meets = new Array(16).fill(false)
    for (const [i, j] of [[1, 1], [2, 1], [1, 2], [2, 2]]) meets[j * size + i] = true
    const edges = regionEdges({ size, meets })
    const sides = edges.reduce((n, [, , mask]) => n + [1, 2, 4, 8].filter((b) => mask & b).length, 0)
    expect(edges).toHaveLength(4)
    expect(sides).toBe(8)
  })
})
