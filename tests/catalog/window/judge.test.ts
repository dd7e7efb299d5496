import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { EDGE_FRACTION, judge, judgeWithBand, MARGIN_LIMIT, parseWindow, type Judgement, type Verdict } from '../../../catalog/window'

// Margins are defined in catalog/window/judge.ts: (value − min)/scale and (max − value)/scale,
// scale = window width when both bounds are given, else |bound| (at least the scale floor).
// The expectations below are worked by hand from that definition.
const window = parseWindow({ kind: 'bistable', peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5 }, travel: { max: 8 } })
const good = { peakForce: 4, valleyForce: -1, secondStablePosition: 6, bistable: true, safetyFactor: 1.5 }

const marginOf = (j: Judgement, id: string) => j.constraints.find((c) => c.id === id)!.margin
const verdictOf = (j: Judgement, id: string) => j.constraints.find((c) => c.id === id)!.verdict

describe('judge (nominal metrics)', () => {
  it('measures each bound against the window width or the bound', () => {
    const observed = judge(window, good)
    expect(marginOf(observed, 'peakForce.min')).toBeCloseTo((4 - 3) / 2, 12)
    expect(marginOf(observed, 'peakForce.max')).toBeCloseTo((5 - 4) / 2, 12)
    expect(marginOf(observed, 'holdingForce.min')).toBeCloseTo((1 - 0.5) / 0.5, 12) // holding = −valley = 1 N
    expect(marginOf(observed, 'travel.max')).toBeCloseTo((8 - 6) / 8, 12)
    expect(observed.margin).toBeCloseTo(0.25, 12)
    expect(observed.verdict).toBe('inside')
    expect(observed.strain).toEqual({ basis: 'peak', safetyFactor: 1.5, margin: 0.5, verdict: 'inside' })
  })

  it('calls a value on the bound or within 5 % of the width of it the edge', () => {
    expect(EDGE_FRACTION).toBe(0.05)
    const onBound = judge(window, { ...good, peakForce: 5 })
    expect(marginOf(onBound, 'peakForce.max')).toBe(0)
    expect(onBound.verdict).toBe('edge')
    const near = judge(window, { ...good, peakForce: 4.95 })
    expect(marginOf(near, 'peakForce.max')).toBeCloseTo(0.025, 12)
    expect(near.verdict).toBe('edge')
    expect(judge(window, { ...good, peakForce: 4.85 }).verdict).toBe('inside') // margin 0.075
  })

  it('calls a value past a bound outside, with a negative margin', () => {
    const observed = judge(window, { ...good, peakForce: 5.2, valleyForce: -0.3 })
    expect(marginOf(observed, 'peakForce.max')).toBeCloseTo(-0.1, 12)
    expect(marginOf(observed, 'holdingForce.min')).toBeCloseTo((0.3 - 0.5) / 0.5, 12)
    expect(observed.verdict).toBe('outside')
    expect(observed.margin).toBeCloseTo(-0.4, 12)
  })

  it('rules out a beam without a second stable position', () => {
    const observed = judge(window, { peakForce: 4, valleyForce: 0.2, secondStablePosition: null, bistable: false })
    expect(verdictOf(observed, 'bistable')).toBe('outside')
    expect(verdictOf(observed, 'travel.max')).toBe('outside')
    expect(marginOf(observed, 'travel.max')).toBeNull()
    expect(observed.margin).toBeNull()
    expect(observed.verdict).toBe('outside')
  })

  it('asks a bistable window of only a kind for bistability alone', () => {
    const bare = parseWindow({ kind: 'bistable' })
    expect(judge(bare, good).verdict).toBe('inside')
    expect(judge(bare, good).margin).toBeNull()
    expect(judge(bare, { ...good, secondStablePosition: null, bistable: false }).verdict).toBe('outside')
  })

  it('measures a one-sided bound of zero against the scale floor', () => {
    const w = parseWindow({ kind: 'spring', stiffness: { min: 0 } })
    expect(marginOf(judge(w, { stiffness: 0.002 }), 'stiffness.min')).toBeCloseTo(0.002 / 0.001, 12)
  })

  it('treats a locking hook (no separation force) as unbounded', () => {
    const w = parseWindow({ kind: 'latch', matingForce: { max: 20 }, separationForce: { min: 30 } })
    const observed = judge(w, { matingForce: 15, separationForce: null, safetyFactor: 2 })
    expect(marginOf(observed, 'separationForce.min')).toBe(MARGIN_LIMIT)
    expect(marginOf(observed, 'matingForce.max')).toBeCloseTo(0.25, 12)
    const capped = parseWindow({ kind: 'latch', separationForce: { max: 30 } })
    expect(judge(capped, { separationForce: null }).verdict).toBe('outside')
  })

  it('checks the footprint in the better of the two orientations', () => {
    const w = parseWindow({ kind: 'bistable', footprint: { length: 45, width: 15 } })
    const observed = judge(w, good, { envelope: { x: 14, y: 44 } })
    expect(marginOf(observed, 'footprint.length')).toBeCloseTo(1 / 45, 12)
    expect(marginOf(observed, 'footprint.width')).toBeCloseTo(1 / 15, 12)
    expect(observed.verdict).toBe('edge')
    expect(judge(w, good, { envelope: { x: 46, y: 10 } }).verdict).toBe('outside')
  })
})

describe('judge (tolerance band)', () => {
  it('judges each bound at the worst end of the band', () => {
    const band = { peakForce: [3.8, 5.1] as [number, number], valleyForce: [-1.2, -0.6] as [number, number], secondStablePosition: [5.5, 6.5] as [number, number], safetyFactor: [1.2, 1.9] as [number, number] }
    const observed = judge(window, band)
    expect(marginOf(observed, 'peakForce.min')).toBeCloseTo(0.4, 12)
    expect(marginOf(observed, 'peakForce.max')).toBeCloseTo(-0.05, 12)
    expect(marginOf(observed, 'holdingForce.min')).toBeCloseTo((0.6 - 0.5) / 0.5, 12)
    expect(marginOf(observed, 'travel.max')).toBeCloseTo((8 - 6.5) / 8, 12)
    expect(observed.verdict).toBe('outside')
    expect(observed.strain?.safetyFactor).toBe(1.2)
  })

  it('rules out a band in which a corner loses its second stable position', () => {
    expect(judge(window, { peakForce: [3.5, 4.5], valleyForce: [-1, 0.1], secondStablePosition: null }).verdict).toBe('outside')
  })

  it('gives both verdicts for the configure screen', () => {
    const observed = judgeWithBand(window, good, { peakForce: [3.6, 5.3], valleyForce: [-1.3, -0.8], secondStablePosition: [5.8, 6.2] })
    expect(observed.nominal.verdict).toBe('inside')
    expect(observed.band.verdict).toBe('outside')
  })
})

const rank: Record<Verdict, number> = { outside: 0, edge: 1, inside: 2 }

describe('judge (properties)', () => {
  const range = fc.tuple(fc.double({ min: 0, max: 100, noNaN: true }), fc.double({ min: 0, max: 100, noNaN: true })).map(([a, b]) => [Math.min(a, b), Math.max(a, b)] as const)
  const value = fc.double({ min: 0, max: 150, noNaN: true })

  it('a larger stiffness never lowers the min margin nor raises the max margin', () => {
    fc.assert(fc.property(range, value, value, ([lo, hi], a, b) => {
      const w = parseWindow({ kind: 'spring', stiffness: { min: lo, max: hi } })
      const [v1, v2] = a <= b ? [a, b] : [b, a]
      const j1 = judge(w, { stiffness: v1 })
      const j2 = judge(w, { stiffness: v2 })
      return marginOf(j2, 'stiffness.min')! >= marginOf(j1, 'stiffness.min')! && marginOf(j2, 'stiffness.max')! <= marginOf(j1, 'stiffness.max')!
    }))
  })

  it('a tighter window never judges the same value better', () => {
    fc.assert(fc.property(range, fc.double({ min: 0, max: 1, noNaN: true }), value, ([lo, hi], shrink, v) => {
      const wide = parseWindow({ kind: 'hinge', rotationalStiffness: { min: lo } })
      const tight = parseWindow({ kind: 'hinge', rotationalStiffness: { min: lo + shrink * (hi - lo) } })
      const jw = judge(wide, { rotationalStiffness: v })
      const jt = judge(tight, { rotationalStiffness: v })
      return rank[jt.verdict] <= rank[jw.verdict]
    }))
  })

  it('a band never judges better than a value it contains', () => {
    fc.assert(fc.property(range, value, value, value, ([lo, hi], a, b, c) => {
      const w = parseWindow({ kind: 'guide', stiffness: { min: lo, max: hi } })
      const [l, m, h] = [a, b, c].sort((x, y) => x - y)
      const jn = judge(w, { stiffness: m })
      const jb = judge(w, { stiffness: [l, h] })
      return (jb.margin as number) <= (jn.margin as number) && rank[jb.verdict] <= rank[jn.verdict]
    }))
  })
})

describe('strain of a working-range family', () => {
  // springs, guides and hinges report their travel up to the strain limit (issue 4), so the
  // factor at that travel is 1 by definition (common practice for stating a flexure's range)
  const spring = parseWindow({ kind: 'spring', stiffness: { min: 0.1, max: 1 } })
  it('does not call a factor of 1 at the end of the range a fault', () => {
    const observed = judge(spring, { stiffness: 0.5, maxTravel: 4, maxStrain: 0.02, safetyFactor: 1 })
    expect(observed.strain).toMatchObject({ basis: 'working-range', verdict: 'inside' })
  })
  it('still calls a factor below 1 outside', () => {
    const observed = judge(spring, { stiffness: 0.5, maxTravel: 4, maxStrain: 0.03, safetyFactor: 0.66 })
    expect(observed.strain).toMatchObject({ basis: 'working-range', verdict: 'outside' })
  })
})
