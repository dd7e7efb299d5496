import { describe, expect, it } from 'vitest'
import { evaluate } from '../../../catalog'
import { calibrationSummary, compareToPrediction, fitModulus, initialSlope, interpolateAt, valleyOf } from '../../../catalog/calibration'

/** mulberry32: a small seeded generator, so the noisy curves are the same on every run. */
function seededRandom(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** Normal deviates by the Box–Muller transform. */
function gaussian(random: () => number): () => number {
  return () => Math.sqrt(-2 * Math.log(1 - random())) * Math.cos(2 * Math.PI * random())
}

/** A "test stand" run: the model at the true modulus, sampled at evenly spaced displacements, with noise. */
function syntheticRun(familyId: string, params: Record<string, number | string>, trueModulus: number, points: number, noiseFraction: number, seed: number, method?: string) {
  const truth = evaluate(familyId, { ...params, modulus: trueModulus }, { method })
  const [lo, hi] = [truth.curve.displacement[0], truth.curve.displacement[truth.curve.displacement.length - 1]]
  const peak = Math.max(...truth.curve.force.map(Math.abs))
  const noise = gaussian(seededRandom(seed))
  const displacement: number[] = []
  const force: number[] = []
  for (let i = 0; i < points; i++) {
    const d = lo + ((hi - lo) * i) / (points - 1)
    displacement.push(d)
    force.push(interpolateAt(truth.curve.displacement, truth.curve.force, d)! + noiseFraction * peak * noise())
  }
  return { displacement, force }
}

describe('fitModulus', () => {
  describe('regression through the origin, a worked example', () => {
    it('gives Σxy / Σx² (Montgomery, Peck & Vining, regression through the origin)', () => {
      // x = predicted, y = measured: Σxy = 2 + 8.2 + 17.7 = 27.9, Σx² = 14, slope 1.992857
      const predicted = { displacement: [0, 1, 2, 3], force: [0, 1, 2, 3] }
      const measured = { displacement: [1, 2, 3], force: [2, 4.1, 5.9] }
      const observed = fitModulus(measured, predicted, 1000)
      expect(observed.fit!.scale).toBeCloseTo(27.9 / 14, 12)
      expect(observed.fit!.modulus).toBeCloseTo((27.9 / 14) * 1000, 9)
      // residuals 2 − 1.992857, 4.1 − 3.985714, 5.9 − 5.978571
      const r = [2 - 27.9 / 14, 4.1 - (2 * 27.9) / 14, 5.9 - (3 * 27.9) / 14]
      expect(observed.fit!.residualRms).toBeCloseTo(Math.sqrt(r.reduce((a, x) => a + x * x, 0) / 3), 12)
    })
  })

  describe('a measurement that is the prediction scaled by a constant', () => {
    it('recovers the constant exactly, interpolating between predicted samples', () => {
      const predicted = { displacement: [0, 0.5, 1.5, 3, 4], force: [0, 0.8, 2.1, 2.6, 1.9] }
      const measured = { displacement: [0.25, 1, 2, 3.5], force: [0.4, 1.45, 2.2666666666666666, 2.25].map((f) => f * 0.8) }
      expect(fitModulus(measured, predicted, 2000).fit!.modulus).toBeCloseTo(1600, 9)
    })
  })

  describe('a synthetic parallel-guide run at 1650 MPa with 1 % noise (seeded)', () => {
    it('recovers the modulus within 1 %', () => {
      const params = { length: 30, thickness: 0.8, depth: 8, spacing: 20, material: 'petg' }
      const measured = syntheticRun('parallel-guide', params, 1650, 60, 0.01, 20240611)
      const predicted = evaluate('parallel-guide', params)
      expect(predicted.material.modulus).toBe(2000)
      const observed = fitModulus(measured, predicted.curve, predicted.material.modulus).fit!
      const expected = 1650
      expect(Math.abs(observed.modulus - expected) / expected).toBeLessThan(0.01)
      expect(observed.pointsUsed).toBe(60)
      expect(observed.rSquared).toBeGreaterThan(0.99)
    })
  })

  describe('a synthetic bistable run at 2400 MPa with 2 % noise (seeded), closed form', () => {
    it('recovers the modulus within 2 %, the peak and the valley within the noise', () => {
      const params = { span: 60, apexHeight: 2.5, thickness: 0.8, depth: 6, postLength: 0, material: 'petg' }
      const measured = syntheticRun('bistable-beam', params, 2400, 80, 0.02, 7, 'closed-form')
      const predicted = evaluate('bistable-beam', params, { method: 'closed-form' })
      const observed = compareToPrediction(measured, predicted.curve, { predictedModulus: 2000, hasValley: true })
      expect(Math.abs(observed.modulusFit!.modulus - 2400) / 2400).toBeLessThan(0.02)
      // a stiffer material scales every force by 2400/2000: peak and valley +20 %
      expect(observed.peakForce!.relative!).toBeGreaterThan(0.15)
      expect(observed.peakForce!.relative!).toBeLessThan(0.25)
      expect(observed.valleyForce!.measured).toBeLessThan(0)
      // the valley is negative: 20 % deeper is a difference of −20 % of |predicted|
      expect(observed.valleyForce!.relative!).toBeLessThan(-0.1)
      expect(observed.valleyForce!.relative!).toBeGreaterThan(-0.3)
    })
  })

  describe('a run at exactly the predicted modulus, no noise (nonlinear FE)', () => {
    it('gives a scale of one', () => {
      const params = { span: 60, apexHeight: 2.5, thickness: 0.8, depth: 6, postLength: 0, material: 'petg' }
      const measured = syntheticRun('bistable-beam', params, 2000, 40, 0, 1)
      const predicted = evaluate('bistable-beam', params)
      expect(fitModulus(measured, predicted.curve, 2000).fit!.scale).toBeCloseTo(1, 9)
    })
  })

  describe('too few measured points inside the predicted range', () => {
    it('gives no fit and says why', () => {
      const predicted = { displacement: [0, 1, 2], force: [0, 1, 2] }
      const observed = fitModulus({ displacement: [1.5, 5, 6, 7], force: [1, 2, 3, 4] }, predicted, 2000)
      expect(observed.fit).toBeNull()
      expect(observed.reason).toMatch(/only 1 measured point/)
    })
  })

  describe('a predicted curve that is zero where measured', () => {
    it('gives no fit', () => {
      const observed = fitModulus({ displacement: [0, 1, 2], force: [1, 1, 1] }, { displacement: [0, 2], force: [0, 0] }, 2000)
      expect(observed.reason).toMatch(/zero at every measured point/)
    })
  })
})

describe('initialSlope', () => {
  it('is the slope of a straight line (least squares with intercept)', () => {
    const curve = { displacement: [0, 0.1, 0.2, 0.3, 1, 2], force: [0.05, 0.35, 0.65, 0.95, 3.05, 6.05] }
    expect(initialSlope(curve, 0.3)).toBeCloseTo(3, 12)
  })
})

describe('valleyOf', () => {
  it('is null for a curve that rises to its end', () => {
    expect(valleyOf({ displacement: [0, 1, 2], force: [0, 1, 2] })).toBeNull()
  })
})

describe('calibrationSummary', () => {
  it('groups per printer and material with mean and sample standard deviation', () => {
    const observed = calibrationSummary([
      { reportId: 1, printer: 'P1', material: 'PETG', modulus: 1800 },
      { reportId: 2, printer: 'P1', material: 'PETG', modulus: 1900 },
      { reportId: 3, printer: 'P1', material: 'PETG', modulus: 2000 },
      { reportId: 4, printer: 'P2', material: 'PETG', modulus: 1700 },
    ])
    expect(observed).toHaveLength(2)
    // mean 1900; deviations −100, 0, 100: s = √(20000 / 2) = 100
    expect(observed[0]).toMatchObject({ printer: 'P1', count: 3, mean: 1900, standardDeviation: 100, range: 200, min: 1800, max: 2000 })
    expect(observed[1]).toMatchObject({ printer: 'P2', count: 1, mean: 1700, standardDeviation: null })
  })
})
