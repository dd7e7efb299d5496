/**
 * The wide-beam (plate action) correction, judged against the published formulas computed
 * here, never by calling catalog/mechanics/wide-beam.ts for the expected value:
 * - plate flexural rigidity D = E·t³/(12(1−ν²)) per unit depth in cylindrical bending
 *   (Timoshenko & Woinowsky-Krieger, Theory of Plates and Shells, 2nd ed., ch. 1);
 * - a beam is wide when its depth is at least five times its thickness (Senturia, Microsystem
 *   Design, ch. 9; the factor five from memory) — docs/references.md §8a;
 * - fixed-guided blade pair k = 24·E·I/L³ and prismatic snap-fit deflection force P = 3·E·I·y/l³
 *   (Howell, Compliant Mechanisms, 2001; Bayer snap-fit design guide, from memory) — §5, §7.
 */
import { describe, expect, it } from 'vitest'
import { evaluate, families, toleranceBand } from '../../../catalog'
import { estimatorFor } from '../../../catalog/search'
import { ValidationError } from '../../../catalog/errors'

/** PETG's Poisson's ratio as docs/references.md §8 states it (Polymer Data Handbook, from memory). */
const NU_PETG = 0.38
const E_PETG = 2000
const PLATE_FACTOR = 1 / (1 - NU_PETG * NU_PETG) // 1.16877…

/** The stiffness-like metric of each family (proportional to E at fixed geometry), and a wide and a narrow section. */
const CASES: Array<{ family: string; metric: string; wide: Record<string, number>; narrow: Record<string, number>; method?: string }> = [
  { family: 'bistable-beam', metric: 'peakForce', wide: { depth: 8, thickness: 0.8 }, narrow: { depth: 3, thickness: 0.8 }, method: 'closed-form' },
  { family: 'bistable-beam', metric: 'peakForce', wide: { depth: 8, thickness: 0.8 }, narrow: { depth: 3, thickness: 0.8 } },
  { family: 'leaf-hinge', metric: 'rotationalStiffness', wide: { depth: 8, thickness: 0.6 }, narrow: { depth: 2.5, thickness: 0.6 } },
  { family: 'notch-hinge', metric: 'rotationalStiffness', wide: { depth: 8, neckThickness: 0.8 }, narrow: { depth: 3.5, neckThickness: 0.8 } },
  { family: 'parallel-guide', metric: 'stiffness', wide: { depth: 8, thickness: 0.8 }, narrow: { depth: 3.5, thickness: 0.8 } },
  { family: 'parallel-guide', metric: 'stiffness', wide: { depth: 8, thickness: 0.8 }, narrow: { depth: 3.5, thickness: 0.8 }, method: 'nonlinear-fe' },
  { family: 'serpentine-spring', metric: 'stiffness', wide: { depth: 6, thickness: 0.8 }, narrow: { depth: 3, thickness: 0.8 } },
  { family: 'snap-hook', metric: 'deflectionForce', wide: { width: 10, rootThickness: 1.6 }, narrow: { width: 6, rootThickness: 1.6 } },
]

function metric(family: string, params: Record<string, number | string>, key: string, method?: string): number {
  return evaluate(family, { ...params, material: 'petg' }, method ? { method } : {}).metrics[key] as number
}

describe('wide beams: every family that bends beams takes wideBeam', () => {
  it('each built-in family bends beams and declares it', () => {
    // bistable beams, living-hinge leaf, notch neck, guide blades, meander spans, snap arm: all bend
    for (const f of families) expect(f.bendsBeams, f.id).toBe(true)
  })

  for (const c of CASES) {
    const label = `${c.family}${c.method ? ` (${c.method})` : ''}`
    it(`${label}: "auto" on a wide section is stiffer than "off" by 1/(1−ν²), on a narrow one by exactly 1`, () => {
      const wideOff = metric(c.family, { ...c.wide, wideBeam: 'off' }, c.metric, c.method)
      const wideAuto = metric(c.family, { ...c.wide, wideBeam: 'auto' }, c.metric, c.method)
      const narrowOff = metric(c.family, { ...c.narrow, wideBeam: 'off' }, c.metric, c.method)
      const narrowAuto = metric(c.family, { ...c.narrow }, c.metric, c.method) // 'auto' is the default
      expect(wideAuto / wideOff).toBeCloseTo(PLATE_FACTOR, 6)
      expect(narrowAuto / narrowOff).toBeCloseTo(1, 12)
    })
  }

  it('"auto" states the rule it applied, "off" says plain beam theory', () => {
    const auto = evaluate('parallel-guide', { material: 'petg' })
    expect(auto.bending).toMatchObject({ wideBeam: 'auto', poissonRatio: NU_PETG, depthOverThickness: 10 })
    expect(auto.bending!.factor).toBeCloseTo(PLATE_FACTOR, 12)
    expect(auto.bending!.statement).toMatch(/1−ν²/)
    expect(auto.bending!.statement).toMatch(/Timoshenko & Woinowsky-Krieger/)
    expect(auto.params.wideBeam).toBe('auto')
    const off = evaluate('parallel-guide', { material: 'petg', wideBeam: 'off' })
    expect(off.bending).toMatchObject({ wideBeam: 'off', factor: 1, modulus: E_PETG })
    expect(off.params.wideBeam).toBe('off')
  })
})

describe('wide beams against the handbook formulas (computed here)', () => {
  const guide = { length: 25, thickness: 0.8, depth: 8 }
  it('parallel guide, linear: "off" is 24·E·I/L³ with E alone, "auto" is 24·D·b/L³ with the plate rigidity', () => {
    const I = (guide.depth * guide.thickness ** 3) / 12
    const beam = (24 * E_PETG * I) / guide.length ** 3
    const D = (E_PETG * guide.thickness ** 3) / (12 * (1 - NU_PETG ** 2))
    const plate = (24 * D * guide.depth) / guide.length ** 3
    expect(metric('parallel-guide', { ...guide, wideBeam: 'off' }, 'stiffness', 'linear')).toBeCloseTo(beam, 9)
    expect(metric('parallel-guide', { ...guide }, 'stiffness', 'linear')).toBeCloseTo(plate, 9)
  })

  it('snap hook, prismatic: a 20 mm wide arm 1.6 mm thick bends as a plate strip, P = 3·D·b·y/l³', () => {
    const hook = { length: 18, rootThickness: 1.6, tipThickness: 1.6, width: 20, undercut: 1 }
    const D = (E_PETG * hook.rootThickness ** 3) / (12 * (1 - NU_PETG ** 2))
    const plate = (3 * D * hook.width * hook.undercut) / hook.length ** 3
    const I = (hook.width * hook.rootThickness ** 3) / 12
    const beam = (3 * E_PETG * I * hook.undercut) / hook.length ** 3
    expect(metric('snap-hook', hook, 'deflectionForce')).toBeCloseTo(plate, 9)
    expect(metric('snap-hook', { ...hook, wideBeam: 'off' }, 'deflectionForce')).toBeCloseTo(beam, 9)
  })

  it('the transition sits at depth = 5 × thickness (Senturia\u2019s rule): just below is a beam, at it a plate', () => {
    const at = { length: 25, thickness: 1, depth: 5 }
    const below = { length: 25, thickness: 1, depth: 4.5 }
    const ratio = (p: Record<string, number>) => metric('parallel-guide', p, 'stiffness', 'linear') / metric('parallel-guide', { ...p, wideBeam: 'off' }, 'stiffness', 'linear')
    expect(ratio(at)).toBeCloseTo(PLATE_FACTOR, 9)
    expect(ratio(below)).toBeCloseTo(1, 12)
  })

  it('a custom modulus takes PETG\u2019s ratio unless poissonRatio is given', () => {
    const p = { length: 25, thickness: 0.8, depth: 8, modulus: 1000 }
    const k0 = metric('parallel-guide', { ...p, wideBeam: 'off' }, 'stiffness', 'linear')
    expect(metric('parallel-guide', p, 'stiffness', 'linear') / k0).toBeCloseTo(PLATE_FACTOR, 9)
    expect(metric('parallel-guide', { ...p, poissonRatio: 0.3 }, 'stiffness', 'linear') / k0).toBeCloseTo(1 / (1 - 0.09), 9)
  })
})

describe('wide beams: the search estimators bend with the same rule', () => {
  for (const f of families) {
    it(`${f.id}: the fast estimate under "auto" and "off" scales as the model does`, () => {
      const estimator = estimatorFor(f)
      const params = Object.fromEntries(f.params.map((p) => [p.key, p.default]))
      const key = estimator.layout!.keys[0]
      const auto = estimator.estimate(params, E_PETG, 0.02, { poissonRatio: NU_PETG, wideBeam: 'auto' })[key] as number
      const off = estimator.estimate(params, E_PETG, 0.02, { poissonRatio: NU_PETG, wideBeam: 'off' })[key] as number
      const modelRatio = metric(f.id, params, key, estimator.reproduces) / metric(f.id, { ...params, wideBeam: "off" }, key, estimator.reproduces)
      expect(auto / off).toBeCloseTo(modelRatio, 3)
    })
  }
})

describe('wideBeam input', () => {
  it('refuses anything but "auto" or "off", naming the field', () => {
    try {
      evaluate('leaf-hinge', { wideBeam: 'plate' })
      expect.unreachable()
    } catch (e) {
      expect(e).toBeInstanceOf(ValidationError)
      expect((e as ValidationError).issues).toEqual([{ field: 'wideBeam', message: 'wideBeam must be one of "auto", "off"' }])
    }
    expect(() => evaluate('leaf-hinge', { poissonRatio: 0.6 })).toThrow(/poissonRatio must be between 0 and 0.49/)
  })
})

describe('wide beams: the tolerance band bends as its nominal part does', () => {
  it('"off" at the nominal point is "off" at every corner (the band of "off" sits below the band of "auto" by the factor)', () => {
    const guide = { length: 25, thickness: 0.8, depth: 8, material: 'petg' }
    const off = toleranceBand('parallel-guide', { ...guide, wideBeam: 'off' }, { method: 'linear' })
    const auto = toleranceBand('parallel-guide', guide, { method: 'linear' })
    // thinner walls stay wide here (8 / 0.85 > 5), so every corner carries the same factor
    expect(auto.metrics.stiffness![0] / off.metrics.stiffness![0]).toBeCloseTo(PLATE_FACTOR, 9)
    expect(auto.metrics.stiffness![1] / off.metrics.stiffness![1]).toBeCloseTo(PLATE_FACTOR, 9)
  })
})
