import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { compileWindow, judge, parseWindow, scoreBand } from '../../../catalog/window'

// compileWindow/scoreBand are the search's fast copy of judge(); they must agree exactly.
describe('scoreBand', () => {
  it('gives the smallest margin judge() gives, over random bistable windows and bands', () => {
    const bound = fc.option(fc.double({ min: 0, max: 10, noNaN: true }), { nil: undefined })
    fc.assert(fc.property(bound, bound, bound, fc.double({ min: 0, max: 10, noNaN: true }), fc.double({ min: 0, max: 3, noNaN: true }), fc.double({ min: -3, max: 0, noNaN: true }), (a, b, c, peak, spread, valley) => {
      const peakForce = a !== undefined && b !== undefined ? { min: Math.min(a, b), max: Math.max(a, b) } : a !== undefined ? { min: a } : undefined
      const raw: Record<string, unknown> = { kind: 'bistable' }
      if (peakForce) raw.peakForce = peakForce
      if (c !== undefined) raw.holdingForce = { min: c }
      const window = parseWindow(raw)
      const low = { peakForce: peak, valleyForce: valley - spread, secondStablePosition: 5, bistable: true }
      const high = { peakForce: peak + spread, valleyForce: valley, secondStablePosition: 6, bistable: true }
      const expected = judge(window, { peakForce: [low.peakForce, high.peakForce], valleyForce: [low.valleyForce, high.valleyForce], secondStablePosition: [5, 6] }).margin
      const observed = scoreBand(compileWindow(window), low, high).margin
      return expected === null ? observed === 1000 : Math.abs(observed - expected) < 1e-12
    }))
  })

  it('rules out a missing second stable position', () => {
    const c = compileWindow(parseWindow({ kind: 'bistable', peakForce: { max: 5 } }))
    expect(scoreBand(c, { peakForce: 3, secondStablePosition: null }, { peakForce: 3, secondStablePosition: null })).toEqual({ margin: -Infinity, binding: -2 })
  })
})
