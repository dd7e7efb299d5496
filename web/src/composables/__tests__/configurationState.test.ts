import { describe, expect, it } from 'vitest'
import { buildConfiguration, configurationFromLink, datasheetQuery, defaultTolerance, mergeParams, printerForm, readLinkedConfiguration, settingsFrom, sortIssues } from '../configurationState'

describe('configuration from a link', () => {
  it('reads params, window, tolerance, printer and method from the query', () => {
    const linked = readLinkedConfiguration({
      params: '{"thickness":0.8,"material":"petg"}',
      window: '{"kind":"bistable","peakForce":{"min":3,"max":5}}',
      tolerance: '{"thickness":0.03,"modulus":0.15}',
      printer: '{"nozzle":0.6,"layer":0.3}',
      method: 'closed-form',
    })
    expect(linked.params).toEqual({ thickness: 0.8, material: 'petg' })
    expect(linked.tolerance).toEqual({ thickness: 0.03, modulus: 0.15 })
    expect(linked.printer).toEqual({ nozzle: 0.6, layer: 0.3 })
    expect(linked.method).toBe('closed-form')
    expect(linked.problems).toEqual([])
    const settings = settingsFrom('bistable', linked, 'nonlinear-fe')
    expect(settings.tolerance).toEqual({ thickness: 0.03, modulusPercent: 15 })
    expect(settings.printer).toEqual({ profile: '0.6/0.3', nozzle: 0.6, layer: 0.3 })
    expect(settings.window.peakForce).toEqual({ min: 3, max: 5 })
  })

  it('names a query field that is not JSON and carries on without it', () => {
    const linked = readLinkedConfiguration({ params: '{thickness:0.8}' })
    expect(linked.params).toBeNull()
    expect(linked.problems).toEqual([{ field: 'params', message: 'params in the link is not valid JSON and was ignored' }])
  })

  it('lays given values over the entry defaults, keeping only numbers and the material', () => {
    expect(mergeParams({ span: 60, thickness: 0.7, material: 'petg' }, { thickness: 0.8, span: 'wide', material: 'pa12', other: null }))
      .toEqual({ span: 60, thickness: 0.8, material: 'pa12' })
  })

  it('round-trips through the data sheet query', () => {
    const form = { values: { span: 60, thickness: 0.8 }, material: 'petg' }
    const settings = { method: 'nonlinear-fe', window: { peakForce: { min: 3, max: 5 }, holdingForce: { min: null, max: null }, travel: { min: null, max: null } }, tolerance: defaultTolerance(), printer: printerForm(null) }
    const config = buildConfiguration('bistable', form, settings)
    expect(config).toEqual({
      params: { span: 60, thickness: 0.8, material: 'petg' },
      method: 'nonlinear-fe',
      window: { kind: 'bistable', peakForce: { min: 3, max: 5 } },
      // common FDM practice defaults (catalog/tolerance/defaults.ts, printability/profile.ts)
      tolerance: { thickness: 0.05, modulus: 0.1 },
      printer: { nozzle: 0.4, layer: 0.2 },
    })
    expect(configurationFromLink(readLinkedConfiguration(datasheetQuery(config)))).toEqual(config)
  })
})

describe('server issues by where they are shown', () => {
  it('puts parameter keys on the form, window paths on their bound, tolerance and printer on their field', () => {
    const observed = sortIssues([
      { field: 'thickness', message: 'Beam thickness must be at most 0.9 mm' },
      { field: 'window.peakForce.min', message: 'peakForce.min (6) must not be above peakForce.max (5)' },
      { field: 'tolerance.thickness', message: 'tolerance.thickness must be between 0 and 0.5 mm' },
      { field: 'printer.layer', message: 'printer.layer (0.5 mm) must not be above printer.nozzle (0.4 mm)' },
      { field: 'window.kind', message: 'window.kind must be "bistable"' },
    ])
    expect(observed.params).toEqual([{ field: 'thickness', message: 'Beam thickness must be at most 0.9 mm' }])
    expect(observed.window).toEqual({ 'peakForce.min': 'peakForce.min (6) must not be above peakForce.max (5)' })
    expect(observed.tolerance).toEqual({ thickness: 'tolerance.thickness must be between 0 and 0.5 mm' })
    expect(observed.printer.layer).toMatch(/must not be above printer.nozzle/)
    expect(observed.other).toEqual(['window.kind must be "bistable"'])
  })
})
