/**
 * The shared unit factors against their definitions, NIST Special Publication 811 (2008),
 * Appendix B.8 and B.9: the inch is 0.0254 m exactly; the gram-force and pound-force are the
 * weights of 1 g and of the avoirdupois pound, 0.453 592 37 kg exactly, under standard gravity
 * 9.806 65 m/s² (exact, CGPM 1901).
 */
import { describe, expect, it } from 'vitest'
import { displacementFactor, fileUnitChoices, forceFactor, RAD_PER_DEG } from '../../../catalog/units'

const STANDARD_GRAVITY = 9.80665
const POUND_KG = 0.45359237

describe('shared unit factors', () => {
  it('take inches to mm and gram-force and pound-force to N by their definitions', () => {
    expect(displacementFactor('in')).toBeCloseTo(0.0254 * 1000, 12)
    expect(forceFactor('gf')).toBeCloseTo(0.001 * STANDARD_GRAVITY, 14)
    expect(forceFactor('lbf')).toBeCloseTo(POUND_KG * STANDARD_GRAVITY, 12)
  })

  it('leave the axes\u2019 own units, rotation and moment as they are, and refuse to scale an unknown unit', () => {
    for (const unit of ['mm', 'deg', 'constructor', '__proto__']) expect(displacementFactor(unit)).toBe(1)
    for (const unit of ['N', 'N·mm', 'toString']) expect(forceFactor(unit)).toBe(1)
  })

  it('offer the file units an entry\u2019s curve can take', () => {
    expect(fileUnitChoices('mm')).toEqual({ displacement: ['mm', 'in'], force: ['N', 'gf', 'lbf'] })
    expect(fileUnitChoices('deg')).toEqual({ displacement: ['deg'], force: ['N·mm'] })
  })

  it('turn 180 degrees into π radians', () => {
    expect(180 * RAD_PER_DEG).toBeCloseTo(Math.PI, 15)
  })
})
