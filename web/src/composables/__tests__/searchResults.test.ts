import { describe, expect, it } from 'vitest'
import type { SearchResult } from '@/api'
import type { Curve } from '@/api/types'
import { configureLocation, confirmationText, progressFraction, progressText, resultFigures } from '@/composables/searchResults'
import { sparkWindow, sparkline } from '@/composables/sparkline'
import { paramsFromQuery, withParams, entryMapWindow } from '@/composables/entryQuery'

const result = {
  entryId: 7, entryName: 'Power switch', family: 'bistable-beam',
  params: { span: 60, apexHeight: 2.1, thickness: 0.7, depth: 6, postLength: 0, material: 'petg' },
  metrics: { peakForce: 4, valleyForce: -0.9, secondStablePosition: 3.8, safetyFactor: 2.4 },
  band: { peakForce: [3.2, 4.9], valleyForce: [-1.2, -0.6], secondStablePosition: [3.7, 3.9], safetyFactor: [2.3, 2.5] },
  margin: 0.07, safetyFactor: 2.3, method: 'table',
  confirmed: { method: 'nonlinear-fe', metrics: { peakForce: 4.04 }, agreement: { peakForce: 0.0099, valleyForce: -0.07 }, verdict: 'inside' },
  why: '#1',
} as unknown as SearchResult

describe('resultFigures', () => {
  it('speaks of holding force in the window’s sign: −valley, its band flipped', () => {
    const [peak, holding, travel] = resultFigures('bistable', result)
    expect(peak).toMatchObject({ key: 'peakForce', unit: 'N', value: 4, band: [3.2, 4.9] })
    expect(holding).toMatchObject({ key: 'holdingForce', value: 0.9, band: [0.6, 1.2] })
    expect(travel).toMatchObject({ key: 'travel', unit: 'mm', value: 3.8 })
  })
})

describe('progress', () => {
  it('climbs with entries searched, then waits on the exact check', () => {
    expect(progressFraction(null)).toBe(0)
    expect(progressFraction({ done: 2, total: 4, considered: 10, phase: 'sampling' })).toBeCloseTo(0.45)
    expect(progressFraction({ done: 4, total: 4, considered: 10, phase: 'confirming' })).toBe(0.95)
    expect(progressText({ done: 2, total: 4, considered: 12345, phase: 'sampling' })).toBe('Entry and material 2 of 4 · 12,345 candidates estimated')
  })
})

describe('confirmationText', () => {
  it('reports the exact verdict and the largest relative difference', () => {
    expect(confirmationText(result)).toEqual({ text: 'inside, within 7 %', tone: 'inside' })
    expect(confirmationText({ ...result, confirmed: null })).toEqual({ text: 'Not checked', tone: 'none' })
  })
})

describe('handing a result to the entry screen', () => {
  it('puts the parameters in the query, and the entry screen reads them back', () => {
    const loc = configureLocation(result)
    expect(loc.path).toBe('/entries/7')
    const observed = paramsFromQuery(loc.query.params)
    expect(observed).toEqual(result.params)
    const form = withParams({ values: { span: 50, apexHeight: 2, thickness: 0.8, depth: 5, postLength: 1 }, material: 'abs' }, observed!, ['span', 'apexHeight', 'thickness', 'depth', 'postLength'], ['petg', 'abs'])
    expect(form).toEqual({ values: { span: 60, apexHeight: 2.1, thickness: 0.7, depth: 6, postLength: 0 }, material: 'petg' })
  })
  it('ignores a query that is not a JSON object', () => {
    expect(paramsFromQuery('not json')).toBeNull()
    expect(paramsFromQuery('[1,2]')).toBeNull()
    expect(paramsFromQuery(undefined)).toBeNull()
  })
  it('turns the entry screen’s force range into a window only where the kind speaks of force', () => {
    expect(entryMapWindow('bistable', { min: 3, max: 5 })).toEqual({ kind: 'bistable', peakForce: { min: 3, max: 5 } })
    expect(entryMapWindow('spring', { min: 3, max: 5 })).toBeNull()
    expect(entryMapWindow('bistable', { min: null, max: null })).toBeNull()
  })
})

describe('sparkline', () => {
  const curve: Curve = { displacement: [0, 1, 2, 3, 4], force: [0, 4, 0, -1, 0], axes: { displacement: { label: 'Displacement', unit: 'mm' }, force: { label: 'Force', unit: 'N' } } }
  it('draws the peak band and the holding bound below zero', () => {
    const w = sparkWindow('bistable', { kind: 'bistable', peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5 } }, curve)
    expect(w.bands).toEqual([[3, 5], [null, -0.5]])
    const d = sparkline(curve, w, 100, 50)
    expect(d.path.startsWith('M')).toBe(true)
    expect(d.path.split('L')).toHaveLength(5)
    expect(d.rects).toHaveLength(2)
    // the peak band sits above the zero line (SVG y grows downwards)
    expect(d.rects[0].y + d.rects[0].height).toBeLessThan(d.zeroY!)
  })
  it('draws a hinge’s stiffness as slopes per degree when the curve is in degrees (1 rad = 180/π deg)', () => {
    const hinge: Curve = { ...curve, axes: { displacement: { label: 'Rotation', unit: 'deg' }, force: { label: 'Moment', unit: 'N·mm' } } }
    const w = sparkWindow('hinge', { kind: 'hinge', rotationalStiffness: { min: 180 / Math.PI } }, hinge)
    expect(w.slopes[0][0]).toBeCloseTo(1, 12)
  })
})
