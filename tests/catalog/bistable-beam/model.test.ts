import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { evaluate, ValidationError } from '../../../catalog'
import { main } from '../../../catalog/cli'

const EXAMPLE = { span: 40, apexHeight: 3, thickness: 0.6, depth: 5, postLength: 0, modulus: 2000 }

/** Valid parameter sets: ratios inside the family's cross-field rules. */
const validParams = fc.record({
  span: fc.double({ min: 20, max: 120, noNaN: true }),
  ratio: fc.double({ min: 1.6, max: 14, noNaN: true }),
  slenderness: fc.double({ min: 25, max: 200, noNaN: true }),
  depth: fc.double({ min: 2, max: 20, noNaN: true }),
  post: fc.double({ min: 0, max: 0.3, noNaN: true }),
}).map(({ span, ratio, slenderness, depth, post }) => {
  const thickness = Math.max(0.2, span / slenderness)
  const apexHeight = Math.min(ratio * thickness, 0.19 * span)
  return { span, thickness, apexHeight, depth, postLength: post < 0.05 ? 0 : post * span }
}).filter((p) => p.apexHeight / p.thickness >= 1.5)

describe('bistable-beam (evaluate)', () => {
  it('bistable-beam (defaults) is bistable, inside its strain limit, with metrics in their units', () => {
    const observed = evaluate('bistable-beam', {})
    expect(observed.method).toBe('nonlinear-fe')
    expect(observed.metrics.bistable).toBe(true)
    expect(observed.metrics.safetyFactor as number).toBeGreaterThan(1)
    expect(observed.curve.axes.displacement).toEqual({ label: 'Shuttle displacement', unit: 'mm' })
    expect(observed.curve.displacement.at(-1)).toBeCloseTo(2 * 2.5, 12)
    expect(observed.curve.displacement.length).toBeGreaterThanOrEqual(101)
    expect(observed.curve.strain?.length).toBe(observed.curve.force.length)
  })

  it('force scales as E·depth·t³·h/l³: doubling the depth doubles every force (Qiu et al. 2004 normalisation)', () => {
    const a = evaluate('bistable-beam', EXAMPLE).metrics, b = evaluate('bistable-beam', { ...EXAMPLE, depth: 10 }).metrics
    expect((b.peakForce as number) / (a.peakForce as number)).toBeCloseTo(2, 9)
    expect((b.energyIn as number) / (a.energyIn as number)).toBeCloseTo(2, 9)
  })

  it('closed-form refuses side posts with a message on the method field', () => {
    let observed: unknown
    try { evaluate('bistable-beam', { ...EXAMPLE, postLength: 2 }, { method: 'closed-form' }) } catch (e) { observed = e }
    expect(observed).toBeInstanceOf(ValidationError)
    expect((observed as ValidationError).issues[0].field).toBe('method')
  })

  it('warns when the beams are monostable and when the strain exceeds the limit', () => {
    const monostable = evaluate('bistable-beam', { ...EXAMPLE, apexHeight: 1.2 })
    expect(monostable.metrics.bistable).toBe(false)
    expect(monostable.metrics.secondStablePosition).toBeNull()
    expect(monostable.warnings.join(' ')).toMatch(/Not bistable/)
    const strained = evaluate('bistable-beam', { ...EXAMPLE, material: 'pla' })
    expect(strained.warnings.join(' ')).toMatch(/exceeds the material's limit/)
  })

  it('random valid parameters never give NaN and the curve starts at zero force (property, fast-check)', () => {
    fc.assert(fc.property(validParams, (p) => {
      const observed = evaluate('bistable-beam', { ...p, modulus: 2000 })
      expect(observed.curve.force[0]).toBe(0)
      expect(observed.curve.displacement[0]).toBe(0)
      for (const v of [...observed.curve.force, ...observed.curve.displacement, ...(observed.curve.strain ?? [])]) expect(Number.isFinite(v)).toBe(true)
      for (const v of Object.values(observed.metrics)) if (typeof v === 'number') expect(Number.isFinite(v)).toBe(true)
    }), { numRuns: 40, seed: 42 })
  })

  it('invalid input is rejected with a message naming the field (property, fast-check)', () => {
    const bad = fc.oneof(
      fc.record({ field: fc.constant('span'), value: fc.double({ min: -100, max: 9.9, noNaN: true }) }),
      fc.record({ field: fc.constant('thickness'), value: fc.double({ min: 5.01, max: 100, noNaN: true }) }),
      fc.record({ field: fc.constant('apexHeight'), value: fc.double({ min: 30.01, max: 1000, noNaN: true }) }),
      fc.record({ field: fc.constant('depth'), value: fc.constant(Number.NaN) }),
      fc.record({ field: fc.constant('postLength'), value: fc.double({ min: -10, max: -0.01, noNaN: true }) }),
    )
    fc.assert(fc.property(bad, ({ field, value }) => {
      let observed: unknown
      try { evaluate('bistable-beam', { ...EXAMPLE, [field]: value }) } catch (e) { observed = e }
      expect(observed).toBeInstanceOf(ValidationError)
      const issue = (observed as ValidationError).issues.find((i) => i.field === field)
      expect(issue?.message.length).toBeGreaterThan(10)
    }), { numRuns: 50, seed: 7 })
  })

  it('cross-field rules name the field: apex height well below the span', () => {
    let observed: unknown
    try { evaluate('bistable-beam', { ...EXAMPLE, span: 20, apexHeight: 5, thickness: 0.8 }) } catch (e) { observed = e }
    expect((observed as ValidationError).issues.map((i) => i.field)).toContain('apexHeight')
    expect((observed as ValidationError).message).toMatch(/well below the span/)
  })
})

function capture() {
  let text = ''
  return { stream: { write: (s: string) => { text += s; return true } } as never, text: () => text }
}

describe('flexshelf evaluate bistable-beam (CLI)', () => {
  it('prints the evaluation as JSON', async () => {
    const out = capture(), err = capture()
    const code = await main(['evaluate', 'bistable-beam', JSON.stringify(EXAMPLE)], out.stream, err.stream)
    expect(code).toBe(0)
    const observed = JSON.parse(out.text())
    expect(observed.family).toBe('bistable-beam')
    expect(observed.method).toBe('nonlinear-fe')
    expect(Object.keys(observed.metrics)).toEqual(['peakForce', 'largestForce', 'valleyForce', 'unstablePosition', 'secondStablePosition', 'secondSnapPosition', 'energyIn', 'energyBarrier', 'bistable', 'maxStrain', 'strainLimit', 'safetyFactor'])
    expect(observed.curve.force.length).toBe(observed.curve.displacement.length)
  })

  it('--method closed-form picks the two-mode model', async () => {
    const out = capture(), err = capture()
    const code = await main(['evaluate', 'bistable-beam', JSON.stringify(EXAMPLE), '--method', 'closed-form'], out.stream, err.stream)
    expect(code).toBe(0)
    expect(JSON.parse(out.text()).method).toBe('closed-form')
  })

  it('bad input prints one message per field on stderr and exits non-zero', async () => {
    const out = capture(), err = capture()
    const code = await main(['evaluate', 'bistable-beam', JSON.stringify({ ...EXAMPLE, span: 5, depth: -1 })], out.stream, err.stream)
    expect(code).toBe(1)
    expect(out.text()).toBe('')
    expect(err.text()).toMatch(/^span: /m)
    expect(err.text()).toMatch(/^depth: /m)
  })
})
