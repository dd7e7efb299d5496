/** Search's fast estimate of the serpentine spring: Castigliano's stiffness and the strain per millimetre on raw numbers (a test holds it to the family's evaluate). */
import { bendingModulus } from '../../mechanics/wide-beam'
import { dedicatedEstimator, layoutOf } from '../../schema/estimator'
import { meanderMoments, travelCap } from './model'

/**
 * The meander's moments of the last (spans, span length, pitch) asked: a search walks the
 * depth innermost and bands the walls, none of which changes them.
 */
let lastSpans = NaN, lastSpanLength = NaN, lastPitch = NaN, lastSecondMoment = NaN, lastLever = NaN
function moments(spans: number, spanLength: number, pitch: number): void {
  if (spans === lastSpans && spanLength === lastSpanLength && pitch === lastPitch) return
  const m = meanderMoments(spans, spanLength, pitch)
  lastSpans = spans; lastSpanLength = spanLength; lastPitch = pitch
  lastSecondMoment = m.secondMoment
  lastLever = m.lever
}

export const estimator = dedicatedEstimator('castigliano', 'castigliano', true,
  layoutOf([['stiffness', 1], ['maxTravel', 0], ['maxStrain', 0], ['safetyFactor', 0]]),
  (p, material, limit, out, bending) => {
    const E = bendingModulus(material, bending, p.depth, p.thickness) // the model's wide-beam rule
    moments(p.spans, p.spanLength, p.pitch)
    // castiglianoStiffness and linearStrainAtForce (model.ts) written out on the moments taken once (the same expressions, to the last bit but for the cube)
    // the cube as a product, not ** 3: the power costs several times as much here and differs only in the last bit
    const t3 = p.thickness * p.thickness * p.thickness
    const k = ((E * p.depth * t3) / 12) / lastSecondMoment
    // strain per mm of travel: at the force k·1 mm, and k ∝ E, so E cancels
    const EI = E * ((p.depth * t3) / 12), EA = E * (p.depth * p.thickness)
    const perMm = k * ((lastLever * p.thickness) / (2 * EI) + 1 / EA)
    const maxTravel = Math.min(limit / perMm, travelCap(p))
    out[0] = k
    out[1] = maxTravel
    out[2] = perMm * maxTravel
    out[3] = limit / (perMm * maxTravel)
    return true
  },
  undefined,
  // stiffness ∝ depth; the strain per millimetre, hence the travel, independent of it
  ['depth'])
