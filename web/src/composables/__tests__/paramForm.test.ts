import { describe, expect, it } from 'vitest'
import type { Material, ParamSpec } from '@/api/types'
import { allowedMaterials, evaluationParams, initialParamModel, localIssues, narrowRange, paramFields, splitIssues } from '../paramForm'

const span: ParamSpec = { key: 'span', label: 'Span', unit: 'mm', default: 40, min: 10, max: 120, step: 0.5, help: 'Distance between the clamps' }
const thickness: ParamSpec = { key: 'thickness', label: 'Thickness', unit: 'mm', default: 0.6, min: 0.3, max: 3, step: 0.05, help: 'In-plane', role: 'wall' }
const spans: ParamSpec = { key: 'turns', label: 'Turns', unit: '', default: 4, min: 1, max: 12, step: 1, help: '', integer: true }

describe('narrowRange', () => {
  it('intersects the family limits with the entry range', () => {
    expect(narrowRange(span, [30, 60])).toEqual({ min: 30, max: 60, narrowed: true })
  })
  it('never widens past the family limits', () => {
    expect(narrowRange(span, [5, 200])).toEqual({ min: 10, max: 120, narrowed: false })
    expect(narrowRange(span, [5, 80])).toEqual({ min: 10, max: 80, narrowed: true })
  })
  it('ignores a range that does not overlap the family limits', () => {
    expect(narrowRange(span, [150, 200])).toEqual({ min: 10, max: 120, narrowed: false })
  })
  it('keeps the family limits without a range', () => {
    expect(narrowRange(span)).toEqual({ min: 10, max: 120, narrowed: false })
  })
})

describe('paramFields', () => {
  it('maps every spec to a field with unit, step, help and narrowed limits', () => {
    const observed = paramFields([span, thickness, spans], { thickness: [0.5, 1.2] })
    expect(observed).toEqual([
      { key: 'span', label: 'Span', unit: 'mm', min: 10, max: 120, step: 0.5, help: 'Distance between the clamps', integer: false, precision: 1, narrowed: false },
      { key: 'thickness', label: 'Thickness', unit: 'mm', min: 0.5, max: 1.2, step: 0.05, help: 'In-plane', integer: false, precision: 2, narrowed: true },
      { key: 'turns', label: 'Turns', unit: '', min: 1, max: 12, step: 1, help: '', integer: true, precision: 0, narrowed: false },
    ])
  })
  it('reads the precision of a tiny step written with an exponent', () => {
    expect(paramFields([{ ...thickness, step: 1e-7 }])[0].precision).toBe(7)
  })
})

describe('initialParamModel', () => {
  it('takes the entry defaults, falling back to the family defaults', () => {
    const observed = initialParamModel([span, thickness], { span: 32, material: 'pla' }, ['petg', 'pla'])
    expect(observed).toEqual({ values: { span: 32, thickness: 0.6 }, material: 'pla' })
  })
  it('uses the first allowed material when the defaults name none', () => {
    expect(initialParamModel([span], {}, ['petg']).material).toBe('petg')
    expect(initialParamModel([span], {}, []).material).toBeNull()
  })
  it('a family that bends beams starts from the entry\'s wide-beam rule, "auto" when it names none; others get no such field', () => {
    expect(initialParamModel([span], { wideBeam: 'off' }, ['petg'], true).wideBeam).toBe('off')
    expect(initialParamModel([span], {}, ['petg'], true).wideBeam).toBe('auto')
    expect(initialParamModel([span], { wideBeam: 'sideways' }, ['petg'], true).wideBeam).toBe('auto')
    expect('wideBeam' in initialParamModel([span], { wideBeam: 'off' }, ['petg'])).toBe(false)
  })
  it('ignores a non-numeric default', () => {
    expect(initialParamModel([span], { span: 'wide' }).values.span).toBe(40)
  })
})

describe('localIssues', () => {
  const fields = paramFields([span, thickness, spans], { span: [20, 60] })
  it('accepts values inside the narrowed range', () => {
    expect(localIssues(fields, { span: 20, thickness: 0.6, turns: 3 })).toEqual([])
  })
  it('names the field, the bound and the entry range', () => {
    expect(localIssues(fields, { span: 15, thickness: 0.6, turns: 3 })).toEqual([{ field: 'span', message: 'Span must be at least 20 mm (allowed 20–60 mm)' }])
    expect(localIssues(fields, { span: 61, thickness: 0.6, turns: 3 })).toEqual([{ field: 'span', message: 'Span must be at most 60 mm (allowed 20–60 mm)' }])
  })
  it('reports an empty field and a fractional count', () => {
    expect(localIssues(fields, { span: null, thickness: 0.6, turns: 2.5 })).toEqual([
      { field: 'span', message: 'Span is needed (20–60 mm)' },
      { field: 'turns', message: 'Turns must be a whole number' },
    ])
  })
})

describe('splitIssues', () => {
  it('puts field issues under their field and the rest in the general list', () => {
    const observed = splitIssues([
      { field: 'span', message: 'Span must be at least 10 mm' },
      { field: 'method', message: 'unknown method "fast"' },
      { field: 'material', message: 'unknown material "nylon"' },
    ], ['span', 'thickness'])
    expect(observed).toEqual({ byField: { span: 'Span must be at least 10 mm', material: 'unknown material "nylon"' }, general: ['unknown method "fast"'] })
  })
  it('repeats a cross-field rule message in the general list', () => {
    const observed = splitIssues([{ field: 'apexHeight', message: 'Apex height must stay below a fifth of the span' }], ['span', 'apexHeight'], [{ fields: ['apexHeight', 'span'] }])
    expect(observed.byField.apexHeight).toBe('Apex height must stay below a fifth of the span')
    expect(observed.general).toEqual(['Apex height must stay below a fifth of the span'])
  })
  it('joins two messages for one field', () => {
    expect(splitIssues([{ field: 'span', message: 'a.' }, { field: 'span', message: 'b.' }], ['span']).byField.span).toBe('a. b.')
  })
})

describe('evaluationParams', () => {
  it('sends the numbers and the material, skipping empty fields', () => {
    expect(evaluationParams({ values: { span: 40, thickness: null }, material: 'petg' })).toEqual({ span: 40, material: 'petg' })
  })
  it('sends the wide-beam choice when the form has one', () => {
    expect(evaluationParams({ values: { span: 40 }, material: 'petg', wideBeam: 'off' })).toEqual({ span: 40, material: 'petg', wideBeam: 'off' })
  })
})

describe('allowedMaterials', () => {
  const m = (id: string) => ({ id, name: id.toUpperCase(), process: 'FDM', modulus: 2000, strainLimit: 0.02, density: 1.2, notes: '', source: '' }) as Material
  it('keeps the entry order and drops unknown ids', () => {
    expect(allowedMaterials([m('pla'), m('petg'), m('tpu')], ['petg', 'nylon', 'pla']).map((x) => x.id)).toEqual(['petg', 'pla'])
  })
  it('offers every material when the entry names none', () => {
    expect(allowedMaterials([m('pla'), m('petg')], []).map((x) => x.id)).toEqual(['pla', 'petg'])
  })
})
