import { describe, expect, it } from 'vitest'
import { judge, judgeWithBand } from '@catalog/window/judge'
import type { ForceWindow } from '@catalog/window/schema'
import { describeConstraint, describeStrain, formatMargin, verdictLabels, verdictSentence } from '../verdict'

const window: ForceWindow = { kind: 'bistable', peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5 } }
// metrics of the demo power switch at 0.7 mm (catalog nonlinear-fe, PETG) and its band at ±0.05 mm, ±10 %
const nominal = { peakForce: 3.65, valleyForce: -1.17, secondStablePosition: 3.82, bistable: true, safetyFactor: 1.64 }
const band = { peakForce: [2.8, 4.57] as [number, number], valleyForce: [-1.23, -0.984] as [number, number], secondStablePosition: [3.74, 3.88] as [number, number], safetyFactor: [1.59, 1.71] as [number, number] }

describe('verdict wording', () => {
  it('uses the three plain verdicts', () => {
    expect(verdictLabels).toEqual({ inside: 'Inside the window', edge: 'At the edge', outside: 'Outside' })
  })

  it('says the nominal part is inside and names the closest numeric bound, not the flag', () => {
    const { nominal: j } = judgeWithBand(window, nominal, band)
    expect(j.verdict).toBe('inside')
    // margins: peak (3.65 − 3)/2 = 0.325, (5 − 3.65)/2 = 0.675, holding (1.17 − 0.5)/0.5 = 1.34
    expect(verdictSentence(j, 'nominal')).toBe('The nominal part is inside every bound; the closest is peak force at least 3 N (3.65 N).')
  })

  it('says which bound a tolerance corner misses, keeping the unit in its case', () => {
    const { band: j } = judgeWithBand(window, nominal, band)
    expect(j.verdict).toBe('outside')
    expect(verdictSentence(j, 'band')).toBe('Some tolerance corner misses peak force at least 3 N (2.8 N).')
  })

  it('writes a margin as a signed percentage of the bound scale', () => {
    const j = judge(window, nominal)
    const peakMin = j.constraints.find((c) => c.id === 'peakForce.min')!
    expect(describeConstraint(peakMin)).toEqual({ asked: 'Peak force at least 3 N', found: '3.65 N', margin: '+32 %' })
    expect(formatMargin(-0.1)).toBe('−10 %')
    expect(formatMargin(0)).toBe('0 %')
    expect(formatMargin(1000)).toBe('far inside')
    expect(formatMargin(null)).toBe('—')
  })

  it('calls a margin within 5 % of the window width "at the edge"', () => {
    const j = judge(window, { ...nominal, peakForce: 4.95 })
    expect(j.verdict).toBe('edge')
    expect(verdictSentence(j, 'nominal')).toBe('The nominal part is within 5 % of a bound: peak force at most 5 N (4.95 N).')
  })

  it('says plainly when the beam springs back (no second stable position)', () => {
    const j = judge(window, { peakForce: 4, valleyForce: 0.2, secondStablePosition: null, bistable: false, safetyFactor: 2 })
    const flag = j.constraints.find((c) => c.id === 'bistable')!
    expect(describeConstraint(flag).found).toBe('No: it springs back')
    expect(j.verdict).toBe('outside')
  })

  it('phrases the strain safety factor against the material limit', () => {
    expect(describeStrain({ basis: 'peak', safetyFactor: 1.64, margin: 0.64, verdict: 'inside' })).toEqual({ factor: '1.64 ×', words: 'Strain below the material limit.', verdict: 'inside' })
    expect(describeStrain({ basis: 'peak', safetyFactor: 0.8, margin: -0.2, verdict: 'outside' }).words).toMatch(/above the material limit/)
    expect(describeStrain(null).factor).toBe('—')
    expect(describeStrain({ basis: 'working-range', safetyFactor: 1, margin: 0, verdict: 'inside' }).words).toMatch(/sets the working range/)
  })
})
