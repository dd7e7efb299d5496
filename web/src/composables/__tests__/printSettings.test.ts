import { describe, expect, it } from 'vitest'
import { checkPrintability } from '@catalog/printability/check'
import { bistableBeam } from '@catalog/families/bistable-beam'
import { applyFix, printerIssues, profileIdOf, toleranceIssues, toleranceSetting } from '../printSettings'

const form = { values: { span: 60, apexHeight: 2.1, thickness: 0.7, depth: 6, postLength: 0 }, material: 'petg' }

describe('printability fix applied to the form', () => {
  it('applies the catalog fix for a wall below two 0.4 mm lines (0.7 → 0.8 mm, common practice)', () => {
    const report = checkPrintability(bistableBeam, form.values, { nozzle: 0.4, layer: 0.2 })
    const wall = report.checks.find((c) => c.id === 'wall.thickness')!
    expect(wall.level).toBe('fail')
    expect(wall.fix).toEqual({ key: 'thickness', from: 0.7, to: 0.8 })
    const observed = applyFix(form, wall.fix!)
    expect(observed?.values.thickness).toBe(0.8)
    expect(observed?.values.span).toBe(60)
    expect(form.values.thickness).toBe(0.7) // the form is not changed in place
  })

  it('does not apply a fix when the value changed since the check, or to an unknown key', () => {
    expect(applyFix({ ...form, values: { ...form.values, thickness: 0.75 } }, { key: 'thickness', from: 0.7, to: 0.8 })).toBeNull()
    expect(applyFix(form, { key: 'width', from: 6, to: 6.2 })).toBeNull()
  })
})

describe('printer and tolerance settings', () => {
  it('recognises the listed profiles and calls anything else custom', () => {
    expect(profileIdOf({ nozzle: 0.6, layer: 0.3 })).toBe('0.6/0.3')
    expect(profileIdOf({ nozzle: 0.5, layer: 0.25 })).toBe('custom')
  })

  it('names the field of a bad custom printer, in the words of the window schema', () => {
    expect(printerIssues({ nozzle: 0.4, layer: 0.5 }).layer).toBe('Layer height must not be above the nozzle (0.4 mm)')
    expect(printerIssues({ nozzle: null, layer: 0.2 }).nozzle).toBe('Nozzle is needed (mm)')
    expect(printerIssues({ nozzle: 0.4, layer: 0.2 })).toEqual({ nozzle: '', layer: '' })
    expect(printerIssues({ nozzle: 1e-300, layer: 1e-300 })).toEqual({ nozzle: 'Nozzle must be from 0.1 to 2 mm', layer: 'Layer height must be from 0.02 to 1 mm' })
  })

  it('checks the tolerance inputs and sends the modulus as a fraction', () => {
    // the bounds are the window schema's (catalog/window/bounds.ts)
    expect(toleranceIssues({ thickness: 1.2, modulusPercent: 10 }).thickness).toBe('Thickness tolerance must be from 0 to 1 mm')
    expect(toleranceIssues({ thickness: 0.6, modulusPercent: 10 }).thickness).toBe('')
    expect(toleranceIssues({ thickness: 0.05, modulusPercent: 55 }).modulus).toBe('Modulus tolerance must be from 0 to 50 %')
    expect(toleranceSetting({ thickness: 0.05, modulusPercent: 7 })).toEqual({ thickness: 0.05, modulus: 0.07 })
  })
})
