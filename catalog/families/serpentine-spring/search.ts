/** Search's fast estimate of the serpentine spring: Castigliano's stiffness and the strain per millimetre on raw numbers (a test holds it to the family's evaluate). */
import { bendingModulus } from '../../mechanics/wide-beam'
import { dedicatedEstimator, layoutOf } from '../../schema/estimator'
import { castiglianoStiffness, linearStrainAtForce, travelCap } from './model'

export const estimator = dedicatedEstimator('castigliano', 'castigliano', true,
  layoutOf([['stiffness', 1], ['maxTravel', 0], ['maxStrain', 0], ['safetyFactor', 0]]),
  (p, material, limit, out, bending) => {
    const E = bendingModulus(material, bending, p.depth, p.thickness) // the model's wide-beam rule
    const k = castiglianoStiffness(p.spans, p.spanLength, p.pitch, (E * p.depth * p.thickness ** 3) / 12)
    // strain per mm of travel: at the force k·1 mm, and k ∝ E, so E cancels
    const perMm = linearStrainAtForce(p, E, k)
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
