import { describe, expect, it } from 'vitest'
import { contrastRatio, cssVariables, palettes } from '../tokens'

// WCAG 2.1 success criterion 1.4.3: at least 4.5:1 for body text, 3:1 for large text and
// for graphical objects (1.4.11). Reference values: black on white is 21:1, and
// #777777 on white is about 4.48:1 (the WebAIM contrast checker's well-known borderline case).
describe('contrastRatio', () => {
  it('gives 21 for black on white and 1 for a colour on itself', () => {
    expect(contrastRatio('#000000', '#FFFFFF')).toBeCloseTo(21, 5)
    expect(contrastRatio('#3C5566', '#3C5566')).toBeCloseTo(1, 10)
  })
  it('puts #777777 on white just below 4.5', () => {
    expect(contrastRatio('#777777', '#FFFFFF')).toBeCloseTo(4.48, 2)
  })
  it('refuses colours that are not #rrggbb', () => {
    expect(() => contrastRatio('teal', '#FFFFFF')).toThrow(/#rrggbb/)
  })
})

describe.each(['light', 'dark'] as const)('the %s palette meets WCAG AA', (mode) => {
  const p = palettes[mode]
  it.each([
    ['ink on bg', p.ink, p.bg],
    ['ink on surface', p.ink, p.surface],
    ['ink on sunken', p.ink, p.sunken],
    ['muted ink on bg', p.inkMuted, p.bg],
    ['muted ink on surface', p.inkMuted, p.surface],
    ['muted ink on sunken', p.inkMuted, p.sunken],
    ['secondary on surface', p.secondary, p.surface],
    ['text on a secondary button', p.onSecondary, p.secondary],
    ['window accent on surface', p.window, p.surface],
    ['window accent on sunken', p.window, p.sunken],
    ['danger on surface', p.danger, p.surface],
    ['warning on surface', p.warning, p.surface],
  ])('%s ≥ 4.5', (_name, fg, bg) => {
    expect(contrastRatio(fg, bg)).toBeGreaterThanOrEqual(4.5)
  })
})

describe('cssVariables', () => {
  it('names every token --fs-kebab-case', () => {
    const observed = cssVariables(palettes.light)
    expect(observed['--fs-ink-muted']).toBe(palettes.light.inkMuted)
    expect(observed['--fs-window-band']).toBe(palettes.light.windowBand)
    expect(Object.keys(observed)).toHaveLength(Object.keys(palettes.light).length)
  })
})
