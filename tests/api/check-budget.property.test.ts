/**
 * Issue 11, the property: no value the window, printer and tolerance schemas accept makes a
 * check exceed its compute budget. fast-check throws printers, tolerances and windows at
 * parseWindow from far outside the physical bounds down to 1e-300 mm; every one accepted is
 * run as a real check (band and printability) on a compute thread under the default 10 s
 * budget, which must answer, never compute_budget_exceeded. The old schema accepted a
 * 1e-300 mm nozzle, whose printability loop ran out of memory, and a 7e-7 mm layer
 * (7.6 s per check): both would fail here. Every refused value must name its field.
 */
import fc from 'fast-check'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { families, ValidationError } from '../../catalog'
import { parseWindow, windowKinds, type ForceWindow } from '../../catalog/window'
import { compute, configureComputePool, DEFAULT_COMPUTE_BUDGET_MS } from '../../api/services/compute-pool'
import { validWindow } from '../catalog/fuzz/windows'

beforeAll(() => configureComputePool({ threads: 1, budgetMs: DEFAULT_COMPUTE_BUDGET_MS }))
afterAll(() => configureComputePool({ threads: 0, budgetMs: DEFAULT_COMPUTE_BUDGET_MS }))

/** Lengths from absurdly small to absurdly large, mm, with the edges of the bounds. */
const anyLength = fc.oneof(
  fc.double({ min: 0, max: 5, noNaN: true, noDefaultInfinity: true }),
  fc.double({ min: 1e-300, max: 1e-3, noNaN: true }),
  fc.constantFrom(1e-300, 7e-7, 0.02, 0.0199, 0.1, 0.0999, 1, 1.0001, 2, 2.0001, 1e300),
)
/** Mostly inside [min, max] (so the accepted side is well covered), sometimes anything. */
const mostlyIn = (min: number, max: number) => fc.oneof({ weight: 3, arbitrary: fc.double({ min, max, noNaN: true }) }, { weight: 1, arbitrary: anyLength })
const printer = fc.record({ nozzle: mostlyIn(0.1, 2), layer: mostlyIn(0.02, 1) }, { requiredKeys: [] })
const tolerance = fc.record({
  thickness: mostlyIn(0, 1),
  modulus: fc.oneof({ weight: 3, arbitrary: fc.double({ min: 0, max: 0.5, noNaN: true }) }, { weight: 1, arbitrary: fc.constantFrom(0.5001, 0.9, 1e-300, 7) }),
}, { requiredKeys: [] })
const windowOf = fc.constantFrom(...windowKinds).chain((kind) => validWindow(kind))
const familyOf = fc.constantFrom(...families.map((f) => f.id))

describe('a check under the compute budget', () => {
  it('answers for every printer, tolerance and window the schema accepts, and names the field of every one it refuses', async () => {
    let accepted = 0
    await fc.assert(fc.asyncProperty(familyOf, windowOf, printer, tolerance, async (familyId, rawWindow, p, t) => {
      let window: ForceWindow
      try {
        window = parseWindow({ ...rawWindow, printer: p, tolerance: t })
      } catch (err) {
        expect(err).toBeInstanceOf(ValidationError)
        for (const issue of (err as ValidationError).issues) expect(issue.field).toMatch(/^(printer|tolerance)\.(nozzle|layer|thickness|modulus)$/)
        return
      }
      accepted++
      const family = families.find((f) => f.id === familyId)!
      // the fast method of each family keeps the run lean; the printability loops do not depend on it
      const method = family.methods[0].id
      const outcome = await compute.check(familyId, {}, { method, tolerance: window.tolerance }, window.printer ?? {}).catch((e: unknown) => e)
      expect((outcome as { code?: string }).code, `${familyId} ${JSON.stringify({ printer: p, tolerance: t })}`).not.toBe('compute_budget_exceeded')
      if (outcome instanceof Error) throw outcome
      expect((outcome as Awaited<ReturnType<typeof compute.check>>).printability.checks.length).toBeGreaterThan(0)
    }), { numRuns: 80, seed: 1111 })
    // the generators must reach the accepted side often enough for the property to mean something
    expect(accepted).toBeGreaterThan(10)
  })
})
