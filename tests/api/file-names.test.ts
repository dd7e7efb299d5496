/** Download file names (api/services/file-names.ts): say what the file is, safe characters only. */
import { describe, expect, it } from 'vitest'
import { families, getFamily } from '../../catalog'
import { dimensionAbbreviations, downloadFileName, slugify } from '../../api/services/file-names'

describe('slugify', () => {
  it('lower-cases, drops accents and punctuation, and cuts at a word', () => {
    expect(slugify('Power switch, field node shell S1')).toBe('power-switch-field-node-shell-s1')
    expect(slugify('Crème brûlée hinge — v2')).toBe('creme-brulee-hinge-v2')
    expect(slugify('Battery door snap hook, field node shell S1')).toBe('battery-door-snap-hook-field')
    expect(slugify('"; rm -rf / #')).toBe('rm-rf')
    expect(slugify('!!!')).toBe('entry')
  })
})

describe('dimensionAbbreviations', () => {
  for (const family of families) {
    it(`${family.id}: one distinct short name per parameter`, () => {
      const observed = Object.values(dimensionAbbreviations(family))
      expect(observed).toHaveLength(family.params.length)
      expect(new Set(observed).size).toBe(observed.length)
      for (const a of observed) expect(a).toMatch(/^[a-z]+$/)
    })
  }

  it('keeps short one-word keys, initials camelCase keys and the first letter of long words', () => {
    expect(dimensionAbbreviations(getFamily('bistable-beam'))).toEqual({ span: 'span', apexHeight: 'ah', thickness: 't', depth: 'depth', postLength: 'pl' })
  })
})

describe('downloadFileName', () => {
  it('names entry, family and dimensions, with a kind suffix', () => {
    const family = getFamily('bistable-beam')
    expect(downloadFileName('Tamper latch, gateway lid G2', family, { span: 45, apexHeight: 2.4, thickness: 0.6, depth: 4, postLength: 1.5, material: 'pa12' }, 'csv', 'curve'))
      .toBe('tamper-latch-gateway-lid-g2-bistable-beam-span45-ah2.4-t0.6-depth4-pl1.5-curve.csv')
  })

  it('writes a minus as m and rounds to six significant digits', () => {
    const family = getFamily('bistable-beam')
    const observed = downloadFileName('x', family, { span: 40.0000001, apexHeight: -1, thickness: 0.6, depth: 4, postLength: 0 }, 'stl')
    expect(observed).toBe('x-bistable-beam-span40-ahm1-t0.6-depth4-pl0.stl')
    expect(observed).toMatch(/^[a-z0-9.-]+$/)
  })
})
