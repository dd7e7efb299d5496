import { describe, expect, it } from 'vitest'
import { parseWindow } from '@catalog/window/schema'
import { describeWindow, emptyWindowForm, windowFromForm, windowFromKeyMetric, windowGroups, windowToForm } from '../configureWindow'

describe('window form by kind', () => {
  it('bistable: a peak-force range, a required holding force and a travel limit, labelled from the catalog', () => {
    const observed = windowGroups('bistable').map((g) => [g.quantity, g.unit, g.fields.map((f) => f.side)])
    const expected = [['peakForce', 'N', ['min', 'max']], ['holdingForce', 'N', ['min']], ['travel', 'mm', ['max']]]
    expect(observed).toEqual(expected)
    expect(windowGroups('bistable')[1].fields[0].label).toBe('Holding force at least')
  })

  it('springs and guides: a stiffness range in N/mm; hinges: rotational stiffness in N·mm/rad; hooks: mating max and separation min', () => {
    expect(windowGroups('spring')[0]).toMatchObject({ quantity: 'stiffness', unit: 'N/mm' })
    expect(windowGroups('guide')[0].fields.map((f) => f.id)).toEqual(['stiffness.min', 'stiffness.max'])
    expect(windowGroups('hinge')[0]).toMatchObject({ quantity: 'rotationalStiffness', unit: 'N·mm/rad' })
    expect(windowGroups('latch').map((g) => g.fields.map((f) => f.id))).toEqual([['matingForce.max'], ['separationForce.min']])
  })

  it('maps the form to the window JSON the catalog accepts, leaving empty sides out', () => {
    const form = emptyWindowForm('bistable')
    form.peakForce = { min: 3, max: 5 }
    form.holdingForce = { min: 0.5, max: null }
    const observed = windowFromForm('bistable', form)
    const expected = { kind: 'bistable', peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5 } }
    expect(observed).toEqual(expected)
    // the same object passes the catalog's own schema unchanged
    expect(parseWindow(observed)).toEqual(expected)
  })

  it('gives no window when no bound is set, so the check runs without a verdict', () => {
    expect(windowFromForm('latch', emptyWindowForm('latch'))).toBeNull()
  })

  it('reads a saved window back into the form and ignores a window of another kind', () => {
    const form = windowToForm('latch', { kind: 'latch', matingForce: { max: 20 }, separationForce: { min: 40 } })
    expect(form.matingForce).toEqual({ min: null, max: 20 })
    expect(form.separationForce).toEqual({ min: 40, max: null })
    expect(windowToForm('latch', { kind: 'bistable', peakForce: { min: 1 } }).matingForce).toEqual({ min: null, max: null })
    expect(windowFromForm('latch', form)).toEqual({ kind: 'latch', matingForce: { max: 20 }, separationForce: { min: 40 } })
  })

  it('describes the window in words', () => {
    expect(describeWindow('bistable', { kind: 'bistable', peakForce: { min: 3, max: 5 }, holdingForce: { min: 0.5 } })).toBe('Peak force 3–5 N · Holding force at least 0.5 N')
    expect(describeWindow('spring', null)).toBe('No force window set')
  })
})

describe('window carried over from the entry page', () => {
  it('turns a range on the key metric into a window of the kind', () => {
    expect(windowFromKeyMetric('bistable', 'peakForce', { min: 3, max: null })).toEqual({ kind: 'bistable', peakForce: { min: 3 } })
    expect(windowFromKeyMetric('hinge', 'rotationalStiffness', { min: 90, max: 130 })).toEqual({ kind: 'hinge', rotationalStiffness: { min: 90, max: 130 } })
  })

  it('gives nothing for an empty range or a metric the window does not speak of', () => {
    expect(windowFromKeyMetric('bistable', 'peakForce', { min: null, max: null })).toBeNull()
    expect(windowFromKeyMetric('latch', 'deflectionForce', { min: 1, max: 2 })).toBeNull()
  })
})
