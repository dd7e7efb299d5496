import { describe, expect, it } from 'vitest'
import { ValidationError, type FieldIssue } from '../../../catalog/errors'
import { parseWindow } from '../../../catalog/window'

// The example window of issue 6, verbatim.
const example = {
  kind: 'bistable', peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5 }, travel: { max: 8 },
  footprint: { length: 45, width: 15 }, materials: ['petg'], printer: { nozzle: 0.4, layer: 0.2 },
  tolerance: { thickness: 0.05, modulus: 0.1 }, text: 'switch', limit: 20,
}

function issuesOf(raw: unknown, options = {}): FieldIssue[] {
  try {
    parseWindow(raw, options)
  } catch (e) {
    if (e instanceof ValidationError) return e.issues
    throw e
  }
  return []
}

describe('parseWindow', () => {
  it('accepts the example window of issue 6 unchanged', () => {
    expect(parseWindow(example)).toEqual(example)
  })

  it('accepts a window of only a kind, for every kind', () => {
    for (const kind of ['bistable', 'spring', 'guide', 'hinge', 'latch']) expect(parseWindow({ kind })).toEqual({ kind })
  })

  it('asks for the kind, and names the allowed ones', () => {
    expect(issuesOf({ peakForce: { min: 1 } })).toEqual([{ field: 'kind', message: 'kind is required: one of bistable, spring, guide, hinge, latch' }])
    expect(issuesOf({ kind: 'toggle' })[0]).toEqual({ field: 'kind', message: 'kind must be one of bistable, spring, guide, hinge, latch' })
    expect(issuesOf('bistable')[0].field).toBe('window')
  })

  it('refuses min above max under the field path', () => {
    expect(issuesOf({ kind: 'bistable', peakForce: { min: 6, max: 5 } })).toEqual([
      { field: 'peakForce.min', message: 'peakForce.min (6) must not be above peakForce.max (5)' },
    ])
  })

  it('refuses negative bounds where a negative value means nothing', () => {
    const observed = issuesOf({ kind: 'bistable', holdingForce: { min: -0.5 }, travel: { max: -1 } })
    expect(observed.map((i) => i.field).sort()).toEqual(['holdingForce.min', 'travel.max'])
    expect(observed.find((i) => i.field === 'holdingForce.min')?.message).toBe('holdingForce.min must not be negative')
  })

  it('refuses an empty range and a range that is not an object', () => {
    expect(issuesOf({ kind: 'spring', stiffness: {} })).toEqual([{ field: 'stiffness', message: 'stiffness needs a min, a max or both' }])
    expect(issuesOf({ kind: 'spring', stiffness: 0.3 })[0].field).toBe('stiffness')
    expect(issuesOf({ kind: 'spring', stiffness: { min: 'low' } })[0]).toEqual({ field: 'stiffness.min', message: 'stiffness.min must be a number in N/mm' })
  })

  it('refuses unknown keys at every level by name', () => {
    const observed = issuesOf({ kind: 'latch', matingForce: { max: 20, typical: 10 }, colour: 'red', printer: { nozzle: 0.4, speed: 60 } })
    expect(observed).toContainEqual({ field: 'matingForce.typical', message: 'unknown field "matingForce.typical"' })
    expect(observed).toContainEqual({ field: 'colour', message: 'unknown window field "colour"' })
    expect(observed).toContainEqual({ field: 'printer.speed', message: 'unknown field "printer.speed"' })
  })

  it('says which kind a misplaced quantity belongs to', () => {
    const [observed] = issuesOf({ kind: 'bistable', stiffness: { min: 1 } })
    expect(observed.field).toBe('stiffness')
    expect(observed.message).toBe('stiffness does not apply to a bistable window (it belongs to spring); a bistable window takes peakForce, holdingForce, travel')
  })

  it('names an unknown material by its place in the list', () => {
    expect(issuesOf({ kind: 'hinge', materials: ['petg', 'unobtainium'] })).toEqual([
      { field: 'materials.1', message: 'unknown material "unobtainium"; known: pla, petg, abs, pa12, pp' },
    ])
    expect(issuesOf({ kind: 'hinge', materials: ['house-petg'] }, { materialIds: ['house-petg'] })).toEqual([])
  })

  it('checks the printer, tolerance, footprint, text and limit fields', () => {
    const observed = issuesOf({
      kind: 'guide', printer: { nozzle: 0.4, layer: 0.6 }, tolerance: { thickness: 1.5, modulus: -0.1 },
      footprint: { length: 0 }, text: 7, limit: 2.5,
    })
    const byField = Object.fromEntries(observed.map((i) => [i.field, i.message]))
    expect(byField['printer.layer']).toBe('printer.layer (0.6 mm) must not be above printer.nozzle (0.4 mm)')
    expect(byField['tolerance.thickness']).toBe('tolerance.thickness must be from 0 to 1 mm')
    expect(byField['tolerance.modulus']).toBe('tolerance.modulus must be from 0 to 0.5 (a fraction: 0.1 = ±10 %)')
    expect(byField['footprint.length']).toBe('footprint.length must be from 1 to 2000 mm')
    expect(byField.text).toBe('text must be a string')
    expect(byField.limit).toBe('limit must be a whole number from 1 to 200')
  })
})

describe('physical bounds of the printer, tolerance and footprint (issue 11)', () => {
  // the values a hostile request used: a 1e-300 mm nozzle built one array entry per printer
  // line and killed the server; a 7e-7 mm layer made one check take 7.6 s
  it('refuses a nozzle outside 0.1–2 mm and a layer outside 0.02–1 mm, naming the field and the bounds', () => {
    const issues = (printer: object) => issuesOf({ kind: 'hinge', printer })
    expect(issues({ nozzle: 1e-300 })).toEqual([{ field: 'printer.nozzle', message: 'printer.nozzle must be from 0.1 to 2 mm' }])
    expect(issues({ nozzle: 0.4, layer: 7e-7 })).toEqual([{ field: 'printer.layer', message: 'printer.layer must be from 0.02 to 1 mm' }])
    expect(issues({ nozzle: 2.5 })[0].field).toBe('printer.nozzle')
    expect(issues({ layer: 1.2 })[0].field).toBe('printer.layer')
    expect(issues({ nozzle: 0.1, layer: 0.02 })).toEqual([])
    expect(issues({ nozzle: 2, layer: 1 })).toEqual([])
  })

  it('refuses a wall tolerance over 1 mm and a modulus tolerance over 50 %', () => {
    expect(issuesOf({ kind: 'hinge', tolerance: { thickness: 1.01 } })[0].field).toBe('tolerance.thickness')
    expect(issuesOf({ kind: 'hinge', tolerance: { modulus: 0.51 } })[0].field).toBe('tolerance.modulus')
    expect(issuesOf({ kind: 'hinge', tolerance: { thickness: 1, modulus: 0.5 } })).toEqual([])
  })

  it('refuses a footprint side under 1 mm or over 2 m', () => {
    expect(issuesOf({ kind: 'hinge', footprint: { length: 1e-300 } })[0].field).toBe('footprint.length')
    expect(issuesOf({ kind: 'hinge', footprint: { width: 2001 } })[0].field).toBe('footprint.width')
    expect(issuesOf({ kind: 'hinge', footprint: { length: 1, width: 2000 } })).toEqual([])
  })
})
