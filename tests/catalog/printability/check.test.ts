import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import type { FamilyDefinition } from '../../../catalog/schema/types'
import {
  checkPrintability, MAX_PRINTABLE_VALUES, nearest, nearestPrintableHeight, nearestPrintableWall, printableHeights, printableWalls, printerRules,
} from '../../../catalog/printability'

// Rules under test are common FDM practice (docs/references.md §8): flexures at least two
// extrusion widths thick, ideally whole perimeters; line width taken as the nozzle width.
const hook: FamilyDefinition = {
  id: 'test-hook', name: 'Test hook', kind: 'latch', summary: '',
  params: [
    { key: 'length', label: 'Arm length', unit: 'mm', default: 15, min: 4, max: 60, step: 0.5, help: '', role: 'length' },
    { key: 'rootThickness', label: 'Root thickness', unit: 'mm', default: 1.6, min: 0.4, max: 6, step: 0.05, help: '', role: 'wall' },
    { key: 'tipThickness', label: 'Tip thickness', unit: 'mm', default: 1.1, min: 0.4, max: 6, step: 0.05, help: '', role: 'wall' },
    { key: 'width', label: 'Width', unit: 'mm', default: 6, min: 1, max: 40, step: 0.5, help: '', role: 'length' },
  ],
  rules: [], methods: [{ id: 'x', label: 'x', source: 'x' }], defaultMethod: 'x', metrics: [],
  axes: { displacement: { label: '', unit: 'mm' }, force: { label: '', unit: 'N' } },
  evaluate: () => { throw new Error('not used') }, build: () => null, envelope: () => ({ x: 0, y: 0, z: 0 }), cautions: [],
}
const checkOf = (report: ReturnType<typeof checkPrintability>, id: string) => report.checks.find((c) => c.id === id)!

describe('printerRules', () => {
  it('takes 0.4 mm nozzle, 0.2 mm layers and a 0.8 mm minimum wall by default', () => {
    expect(printerRules()).toEqual({ nozzle: 0.4, layer: 0.2, lineWidth: 0.4, minimumWall: 0.8 })
    expect(printerRules({ nozzle: 0.6, layer: 0.3 }).minimumWall).toBeCloseTo(1.2, 12)
    expect(printerRules({ nozzle: 0.4, lineWidth: 0.45 }).minimumWall).toBeCloseTo(0.9, 12)
  })

  it('lists whole-perimeter walls of at least two lines inside a range', () => {
    expect(printableWalls(printerRules(), 0.3, 2)).toEqual([0.8, 1.2, 1.6, 2])
    expect(printableWalls(printerRules(), 0.3, 0.7)).toEqual([])
  })
})

describe('checkPrintability', () => {
  it('fails a 0.6 mm wall on a 0.4 mm nozzle and offers 0.8 mm', () => {
    const observed = checkOf(checkPrintability(hook, { length: 15, rootThickness: 0.6, tipThickness: 0.8, width: 6 }), 'wall.rootThickness')
    expect(observed.level).toBe('fail')
    expect(observed.message).toMatch(/below the minimum wall of 0\.8 mm/)
    expect(observed.fix).toEqual({ key: 'rootThickness', from: 0.6, to: 0.8 })
  })

  it('passes whole perimeters and warns on a fraction with the nearest whole count', () => {
    const report = checkPrintability(hook, { length: 15, rootThickness: 1.2, tipThickness: 1.1, width: 6 })
    expect(checkOf(report, 'wall.rootThickness')).toEqual({ id: 'wall.rootThickness', level: 'ok', message: 'Root thickness 1.2 mm is 3 perimeters of 0.4 mm lines' })
    const tip = checkOf(report, 'wall.tipThickness')
    expect(tip.level).toBe('warn')
    expect(tip.message).toMatch(/2\.75 perimeters/)
    expect(tip.fix).toEqual({ key: 'tipThickness', from: 1.1, to: 1.2 })
  })

  it('keeps the fix inside the entry\u2019s allowed range', () => {
    const observed = checkOf(checkPrintability(hook, { length: 15, rootThickness: 1.1, tipThickness: 0.8, width: 6 }, {}, { ranges: { rootThickness: [0.9, 1.15] } }), 'wall.rootThickness')
    expect(observed.level).toBe('warn')
    expect(observed.fix).toBeUndefined()
    const low = checkOf(checkPrintability(hook, { length: 15, rootThickness: 0.6, tipThickness: 0.8, width: 6 }, {}, { ranges: { rootThickness: [0.5, 0.7] } }), 'wall.rootThickness')
    expect(low.level).toBe('fail')
    expect(low.fix).toBeUndefined()
    expect(low.message).toMatch(/no printable value lies inside the allowed range 0\.5 mm–0\.7 mm/)
  })

  it('checks the print height against whole layers', () => {
    const ok = checkOf(checkPrintability(hook, { length: 15, rootThickness: 1.2, tipThickness: 0.8, width: 6 }), 'height.width')
    expect(ok.level).toBe('ok')
    expect(ok.message).toMatch(/30 layers of 0\.2 mm/)
    const off = checkOf(checkPrintability(hook, { length: 15, rootThickness: 1.2, tipThickness: 0.8, width: 6.5 }, { nozzle: 0.4, layer: 0.3 }), 'height.width')
    expect(off.level).toBe('warn')
    expect(off.fix).toEqual({ key: 'width', from: 6.5, to: 6.6 }) // 6.5 / 0.3 = 21.67 layers → 22 layers
  })

  it('warns on a layer above three quarters of the nozzle and always notes orientation and infill', () => {
    const report = checkPrintability(hook, { length: 15, rootThickness: 1.2, tipThickness: 0.8, width: 6 }, { nozzle: 0.4, layer: 0.32 })
    expect(checkOf(report, 'layer').level).toBe('warn')
    expect(report.notes.some((n) => /bending plane is the build plane/.test(n) && /common practice/.test(n))).toBe(true)
    expect(report.notes.some((n) => /100 % infill/.test(n))).toBe(true)
    expect(report.notes.some((n) => /Fillet flexure roots/.test(n))).toBe(true)
  })
})

describe('loops whose count comes from the printer (issue 11)', () => {
  it('lists at most MAX_PRINTABLE_VALUES walls and heights, evenly picked, however fine the printer', () => {
    // the hostile printer of the issue: one array entry per 1e-300 mm line would never end
    const fine = printerRules({ nozzle: 1e-300, layer: 1e-300 })
    const walls = printableWalls(fine, 0.3, 2)
    const heights = printableHeights(fine, 1, 40)
    expect(walls.length).toBe(MAX_PRINTABLE_VALUES)
    expect(heights.length).toBe(MAX_PRINTABLE_VALUES)
    expect(Math.min(...heights)).toBeGreaterThanOrEqual(1 - 1e-9)
    expect(Math.max(...heights)).toBeLessThanOrEqual(40 + 1e-9)
  })

  it('answers a check on such a printer with its usual checks, in a bounded number of steps', () => {
    const report = checkPrintability(hook, { length: 15, rootThickness: 1.2, tipThickness: 1.1, width: 6 }, { nozzle: 1e-300, layer: 7e-7 })
    expect(report.checks.map((c) => c.id)).toEqual(['layer', 'wall.rootThickness', 'wall.tipThickness', 'height.width'])
  })

  it('finds the same nearest wall and height in constant time as by listing every one (the lower on a tie)', () => {
    fc.assert(fc.property(
      fc.constantFrom(0.25, 0.4, 0.6, 0.8), fc.constantFrom(0.08, 0.1, 0.2, 0.3),
      fc.double({ min: 0.2, max: 8, noNaN: true }), fc.double({ min: 0, max: 6, noNaN: true }), fc.double({ min: 0.1, max: 10, noNaN: true }),
      (nozzle, layer, v, lo, span) => {
        const rules = printerRules({ nozzle, layer })
        const hi = lo + span
        expect(nearestPrintableWall(rules, lo, hi, v)).toBe(nearest(printableWalls(rules, lo, hi, Infinity), v))
        expect(nearestPrintableHeight(rules, lo, hi, v)).toBe(nearest(printableHeights(rules, lo, hi, Infinity), v))
      },
    ), { numRuns: 300, seed: 11 })
  })
})
