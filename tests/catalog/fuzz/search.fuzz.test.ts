/**
 * Fuzz of the shelf search (`searchShelfSync`) over the demo shelf with random force windows.
 * 1000 cases; one in five is well-formed and runs a real search with a small budget
 * (8 samples per entry and material, no refinement, at most one exact confirmation), which
 * costs 10–600 ms depending on the kind; the rest carry one planted fault and are refused
 * before any estimate runs. The file stays under about a minute on the 2-core machine.
 */
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { DEMO_SHELF, families, searchShelfSync } from '../../../catalog/index'
import { familyKindsForWindow, type WindowKind } from '../../../catalog/window'
import { describeError, expectNoNonFinite, expectRefusedNaming } from './arbitraries'
import { windowCases } from './windows'

const RUNS = 1000
const familyKind = new Map(families.map((f) => [f.id, f.kind]))
const released = new Map(DEMO_SHELF.filter((e) => e.status === 'released').map((e) => [e.id, e]))

/** A random window is rarely met by anything; dropping some of its narrowing fields lets many searches find results. */
function loosened(window: Record<string, unknown>, mask: number): Record<string, unknown> {
  const out = { ...window }
  if (mask & 1) delete out.text
  if (mask & 2) delete out.footprint
  if (mask & 4) delete out.materials
  if (mask & 8) delete out.printer
  if (mask & 3) delete out.tolerance
  return out
}

describe('searchShelfSync over the demo shelf under fuzzed windows', () => {
  it(`answers finite results of the window's kind, or refuses naming the field, over ${RUNS} cases`, () => {
    let searched = 0
    let withResults = 0
    fc.assert(
      fc.property(windowCases(20), fc.boolean(), fc.nat({ max: 15 }), (generated, confirm, loosen) => {
        const c = generated.tag === 'valid' ? { ...generated, window: loosened(generated.window, loosen) } : generated
        let answer: ReturnType<typeof searchShelfSync> | undefined
        let error: unknown
        try {
          answer = searchShelfSync(c.window, DEMO_SHELF, { budget: 8, refine: false, confirm: confirm ? 1 : 0 })
        } catch (e) {
          error = e
        }
        if (c.tag === 'fault') {
          if (answer) throw new Error(`a window with a fault in ${c.field} was searched: ${JSON.stringify(c.window)}`)
          expectRefusedNaming(error, c.field)
          return
        }
        if (!answer) throw new Error(`a well-formed window failed: ${describeError(error)}\n${JSON.stringify(c.window)}`)
        searched++
        expectNoNonFinite(answer)
        expect(answer.explanation.length).toBeGreaterThan(0)
        const window = c.window as { kind: WindowKind; limit?: number }
        expect(answer.results.length).toBeLessThanOrEqual(window.limit ?? 20)
        if (answer.results.length) withResults++
        for (const r of answer.results) {
          // only released entries, and only families that answer this kind of window
          expect(released.has(r.entryId)).toBe(true)
          expect(familyKindsForWindow[window.kind]).toContain(familyKind.get(r.family))
          expect(r.why.length).toBeGreaterThan(0)
        }
      }),
      { numRuns: RUNS, seed: 8_2029 },
    )
    console.log(`search: ${RUNS} windows, ${searched} searched (${withResults} with results), ${RUNS - searched} refused`)
    expect(searched).toBeGreaterThan(60)
    expect(withResults).toBeGreaterThan(10)
  })
})
