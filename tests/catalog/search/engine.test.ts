import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { families, getFamily } from '../../../catalog'
import { printerRules } from '../../../catalog/printability'
import { DEMO_SHELF, searchShelf, searchShelfSync, type SearchProgress, type ShelfEntry } from '../../../catalog/search'
import { toleranceBand } from '../../../catalog/tolerance'
import { judge, parseWindow, type ForceWindow } from '../../../catalog/window'

const guideEntry = DEMO_SHELF.find((e) => e.familyId === 'parallel-guide')!
const springEntry = DEMO_SHELF.find((e) => e.familyId === 'serpentine-spring')!

describe('searchShelfSync: known answers', () => {
  it('finds a guide configuration evaluated directly (or one within a grid step of it)', () => {
    // The target is evaluated by the family's own linear method (Roark 7th ed., 24EI/L³) over
    // the tolerance corners; the window is that band widened by 3 %.
    const target = { length: 20, thickness: 1.2, depth: 6, spacing: 14 }
    const band = toleranceBand('parallel-guide', { ...target, material: 'petg' }, { method: 'linear' })
    const [lo, hi] = band.metrics.stiffness!
    const window = { kind: 'guide', stiffness: { min: lo * 0.97, max: hi * 1.03 }, materials: ['petg'], text: 'plunger', limit: 200 }
    const observed = searchShelfSync(window, DEMO_SHELF, { confirm: 1 })
    expect(observed.results.length).toBeGreaterThan(0)
    const near = observed.results.find((r) => r.params.thickness === 1.2 && Math.abs((r.params.length as number) - 20) <= 1.25 && Math.abs((r.params.depth as number) - 6) <= 0.8)
    expect(near).toBeDefined()
    // the linear guide is its own fast estimate; the exact confirmation reports its agreement
    expect(observed.results[0].confirmed?.method).toBeDefined()
    expect(observed.results.every((r) => r.entryId === guideEntry.id && r.params.material === 'petg')).toBe(true)
  })

  it('answers a window no module can meet with an empty list that says why and how far', () => {
    const observed = searchShelfSync({ kind: 'spring', stiffness: { min: 500 } }, DEMO_SHELF)
    expect(observed.results).toEqual([])
    expect(observed.considered).toBeGreaterThan(0)
    expect(observed.explanation).toMatch(/stiffness below the window: \d+/)
    expect(observed.explanation).toMatch(/The nearest was "Status button return spring, gateway G2"/)
    expect(observed.explanation).toMatch(/short by \d+ % of the window/)
  })

  it('says when no entry of the kind matches the text or material', () => {
    expect(searchShelfSync({ kind: 'guide', text: 'zzzzqqq' }, DEMO_SHELF).explanation).toMatch(/no released guide module matches the text "zzzzqqq"/)
    expect(searchShelfSync({ kind: 'guide', materials: ['pp'] }, DEMO_SHELF).explanation).toMatch(/no released guide module is offered in pp/)
  })

  it('refuses a bad window with one issue per field', () => {
    expect(() => searchShelfSync({ kind: 'spring', stiffness: { min: 2, max: 1 } }, DEMO_SHELF)).toThrow(/stiffness.min \(2\) must not be above stiffness.max \(1\)/)
  })
})

function bandRecord(r: { band: Record<string, [number, number] | null> }) {
  return r.band
}

function assertRespects(window: ForceWindow, results: ReturnType<typeof searchShelfSync>['results']) {
  const rules = printerRules(window.printer)
  for (const r of results) {
    const family = getFamily(r.family)
    const entry = DEMO_SHELF.find((e) => e.id === r.entryId)!
    const numeric = Object.fromEntries(Object.entries(r.params).filter(([, v]) => typeof v === 'number')) as Record<string, number>
    const env = family.envelope(numeric)
    const judged = judge(window, bandRecord(r), { envelope: env })
    if (judged.verdict === 'outside') throw new Error(`${r.entryId} ${JSON.stringify(r.params)} is outside: ${JSON.stringify(judged.constraints)}`)
    if (r.safetyFactor !== null && r.safetyFactor < 1 - 1e-9) throw new Error(`strain over the limit: ${r.safetyFactor}`)
    if (window.materials && !window.materials.includes(r.params.material as string)) throw new Error('material outside the window')
    if (!entry.materials.includes(r.params.material as string)) throw new Error('material outside the entry')
    for (const spec of family.params) {
      const range = entry.ranges[spec.key]
      const v = numeric[spec.key]
      if (range && (v < range[0] - 1e-9 || v > range[1] + 1e-9)) throw new Error(`${spec.key} ${v} outside ${range}`)
      if (spec.role === 'wall') {
        const perimeters = v / rules.lineWidth
        if (perimeters < 2 - 1e-9 || Math.abs(perimeters - Math.round(perimeters)) > 1e-6) throw new Error(`${spec.key} ${v} is not whole perimeters`)
      }
    }
    if (family.kind !== window.kind) throw new Error('wrong kind')
  }
}

const positiveRange = (lo: number, hi: number) => fc.tuple(fc.double({ min: lo, max: hi, noNaN: true }), fc.double({ min: lo, max: hi, noNaN: true })).map(([a, b]) => ({ min: Math.min(a, b), max: Math.max(a, b) }))
const randomWindow = fc.oneof(
  fc.record({ kind: fc.constant('spring'), stiffness: positiveRange(0.01, 3), travel: fc.record({ min: fc.double({ min: 0, max: 10, noNaN: true }) }) }),
  fc.record({ kind: fc.constant('guide'), stiffness: positiveRange(0.1, 20), footprint: fc.record({ length: fc.double({ min: 20, max: 60, noNaN: true }), width: fc.double({ min: 10, max: 40, noNaN: true }) }) }),
  fc.record({ kind: fc.constant('hinge'), rotationalStiffness: positiveRange(1, 2000), rotation: fc.record({ min: fc.double({ min: 0, max: 40, noNaN: true }) }), materials: fc.constant(['petg']) }),
  fc.record({ kind: fc.constant('latch'), matingForce: fc.record({ max: fc.double({ min: 1, max: 60, noNaN: true }) }), separationForce: fc.record({ min: fc.double({ min: 0, max: 40, noNaN: true }) }), tolerance: fc.record({ thickness: fc.double({ min: 0, max: 0.1, noNaN: true }), modulus: fc.double({ min: 0, max: 0.3, noNaN: true }) }) }),
)

describe('searchShelfSync: properties', () => {
  it('every result respects every constraint of a random window', () => {
    fc.assert(fc.property(randomWindow, (raw) => {
      const window = parseWindow({ ...raw, limit: 30 })
      assertRespects(window, searchShelfSync(window, DEMO_SHELF, { confirm: 0, budget: 800 }).results)
    }), { numRuns: 25 })
  })

  it('a tighter window never adds results', () => {
    fc.assert(fc.property(positiveRange(0.01, 2), fc.double({ min: 0, max: 0.45, noNaN: true }), ({ min, max }, shrink) => {
      const cut = (max - min) * shrink
      const wide = searchShelfSync({ kind: 'spring', stiffness: { min, max }, limit: 200 }, DEMO_SHELF, { confirm: 0, refine: false, budget: 600 })
      const tight = searchShelfSync({ kind: 'spring', stiffness: { min: min + cut, max: max - cut }, limit: 200 }, DEMO_SHELF, { confirm: 0, refine: false, budget: 600 })
      const key = (r: { entryId: unknown; params: unknown }) => `${r.entryId}|${JSON.stringify(r.params)}`
      const wideKeys = new Set(wide.results.map(key))
      if (wide.results.length < 200) expect(tight.results.every((r) => wideKeys.has(key(r)))).toBe(true)
      expect(tight.results.length).toBeLessThanOrEqual(wide.results.length)
    }), { numRuns: 15 })
  })

  it('a tighter tolerance never removes results (the band only shrinks)', () => {
    const window = { kind: 'spring', stiffness: { min: 0.2, max: 0.4 }, limit: 200 }
    const loose = searchShelfSync({ ...window, tolerance: { thickness: 0.05, modulus: 0.1 } }, DEMO_SHELF, { confirm: 0, refine: false })
    const tight = searchShelfSync({ ...window, tolerance: { thickness: 0.02, modulus: 0.05 } }, DEMO_SHELF, { confirm: 0, refine: false })
    expect(tight.results.length).toBeGreaterThanOrEqual(loose.results.length)
  })
})

describe('searchShelf (asynchronous)', () => {
  it('reports progress up to done and gives the same answer as the synchronous run', async () => {
    const seen: SearchProgress[] = []
    const window = { kind: 'spring', stiffness: { min: 0.2, max: 0.4 }, limit: 5 }
    const observed = await searchShelf(window, DEMO_SHELF, { onProgress: (p) => seen.push(p), confirm: 0 })
    const expected = searchShelfSync(window, DEMO_SHELF, { confirm: 0 })
    expect(observed.results.map((r) => r.params)).toEqual(expected.results.map((r) => r.params))
    expect(seen.at(-1)).toMatchObject({ phase: 'done', done: seen.at(-1)!.total })
    expect(seen.map((p) => p.done)).toEqual([...seen.map((p) => p.done)].sort((a, b) => a - b))
  })

  it('stops with an AbortError when cancelled', async () => {
    const controller = new AbortController()
    const shelf: ShelfEntry[] = Array.from({ length: 40 }, (_, i) => ({ ...springEntry, id: `spring-${i}` }))
    const running = searchShelf({ kind: 'spring', stiffness: { min: 0.2, max: 0.4 } }, shelf, { signal: controller.signal, onProgress: (p) => { if (p.done >= 1) controller.abort() } })
    await expect(running).rejects.toMatchObject({ name: 'AbortError' })
  })

  it('refuses to start when already cancelled', () => {
    const controller = new AbortController()
    controller.abort()
    expect(() => searchShelfSync({ kind: 'guide' }, DEMO_SHELF, { signal: controller.signal })).toThrow(/cancelled/)
  })
})

describe('search over made-up families', () => {
  it('searches only the families it is given', () => {
    const observed = searchShelfSync({ kind: 'guide' }, DEMO_SHELF, { families: families.filter((f) => f.id !== 'parallel-guide') })
    expect(observed.results).toEqual([])
    expect(observed.explanation).toMatch(/no released entry is a guide module/)
  })
})
