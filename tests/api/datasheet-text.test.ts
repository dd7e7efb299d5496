/** Text runs for the PDF (api/services/datasheet-text.ts): each run in the Plex file that has its glyphs. */
import { describe, expect, it } from 'vitest'
import { fontBuffers, textRuns } from '../../api/services/datasheet-text'

describe('textRuns', () => {
  it('keeps Latin text in one run of the asked weight', () => {
    expect(textRuns('Span 60 mm ± 0.05 – 2 %', 'semibold')).toEqual([{ font: 'semibold', text: 'Span 60 mm ± 0.05 – 2 %' }])
  })

  it('writes Greek and extended Latin in their own files', () => {
    expect(textRuns('strain ε at Łódź')).toEqual([
      { font: 'regular', text: 'strain ' }, { font: 'greek', text: 'ε' }, { font: 'regular', text: ' at ' },
      { font: 'latinExt', text: 'Ł' }, { font: 'regular', text: 'ód' }, { font: 'latinExt', text: 'ź' },
    ])
  })

  it('gives plain stand-ins for signs no file has, and folds super- and subscripts', () => {
    expect(textRuns('≈ 2 %, x ≤ 3, k₀, t⁴, line\nbreak').map((r) => r.text).join('')).toBe('~ 2 %, x <= 3, k0, t4, line break')
  })
})

describe('fontBuffers', () => {
  it('reads the four IBM Plex Sans WOFF files shipped with @fontsource', () => {
    for (const bytes of Object.values(fontBuffers())) expect(bytes.subarray(0, 4).toString('latin1')).toBe('wOFF')
  })
})
