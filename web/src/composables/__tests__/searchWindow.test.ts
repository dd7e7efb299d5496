import { describe, expect, it } from 'vitest'
import { DEMO_SHELF, searchShelfSync } from '@catalog/search'
import { parseWindow } from '@catalog/window'
import { applyPreset, emptySearchForm, issueField, searchPresets, toWindow, withKind } from '@/composables/searchWindow'

describe('toWindow', () => {
  it('sends only what was filled in, with the modulus tolerance as a fraction', () => {
    const form = emptySearchForm('bistable')
    form.ranges.peakForce = { min: 3, max: 5 }
    form.ranges.holdingForce = { min: 0.5, max: null }
    form.footprint = { length: 45, width: 15 }
    form.materials = ['petg']
    form.text = '  switch '
    const observed = toWindow(form, 20)
    const expected = {
      kind: 'bistable', peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5 }, footprint: { length: 45, width: 15 }, materials: ['petg'],
      printer: { nozzle: 0.4, layer: 0.2 }, tolerance: { thickness: 0.05, modulus: 0.1 }, text: 'switch', limit: 20,
    }
    expect(observed).toEqual(expected)
    // the issue's own example window, which the catalog accepts as it stands
    expect(() => parseWindow(observed)).not.toThrow()
  })

  it('drops the ranges of the old kind when the kind changes', () => {
    const form = emptySearchForm('bistable')
    form.ranges.peakForce = { min: 3, max: 5 }
    const spring = withKind(form, 'spring')
    expect(Object.keys(spring.ranges).sort()).toEqual(['stiffness', 'travel'])
    expect(toWindow(spring).peakForce).toBeUndefined()
  })

  it('maps server issues onto the inputs that caused them', () => {
    expect(issueField('peakForce.min')).toBe('peakForce.min')
    expect(issueField('tolerance.modulus')).toBe('tolerance.modulusPercent')
    expect(issueField('materials.0')).toBe('materials')
  })
})

describe('search presets', () => {
  for (const preset of searchPresets) {
    it(`"${preset.label}" is a valid window that finds configurations on the demo shelf`, () => {
      const window = toWindow(applyPreset(emptySearchForm(), preset))
      expect(window.kind).toBe(preset.kind)
      const answer = searchShelfSync(window, DEMO_SHELF, { confirm: 0 })
      expect(answer.results.length, answer.explanation).toBeGreaterThan(0)
    })
  }
})
